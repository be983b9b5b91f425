import type { Polygon } from 'geojson';
import type { AccessGrade, GrowthGrade, Material, Stories } from '../estimating/types';
import type { PlanFacet, PlanSource } from '../schemas/roof-plan';
import { carryEdges } from './edges';
import type { UnitSystem } from './format';
import { PlanMeasurer } from './plan-measure';
import { History } from './undo';

export type FacetPatch = Partial<
	Pick<
		PlanFacet,
		'label' | 'pitch' | 'material' | 'growth' | 'access' | 'stories' | 'edges' | 'growthSuggestion'
	>
>;

export interface PlanMeta {
	/** The saved version this editor started from; null for a site without a plan. */
	baseVersion: number | null;
	source: PlanSource;
	readOnly: boolean;
}

const DEFAULTS = {
	pitch: 6,
	material: 'asphalt_shingle' as Material,
	growth: 'G1' as GrowthGrade,
	access: 'ground' as AccessGrade,
	stories: 1 as Stories
};

/**
 * The editor's one source of truth: the facets, which one is selected, undo history and the
 * live measurements. The maps only draw it and report gestures back.
 */
export class EditorState {
	/** Replaced, never mutated: raw state keeps object identity for the measurement cache. */
	facets = $state.raw<PlanFacet[]>([]);
	selectedId = $state<string | null>(null);
	units = $state<UnitSystem>('imperial');
	/** Outline being drawn or dragged right now, measured live but not yet committed. */
	live = $state.raw<{ id: string; geometry: Polygon } | null>(null);
	meta = $state<PlanMeta>({ baseVersion: null, source: 'remote', readOnly: false });
	/** Changes since the last save or load. */
	dirty = $state(false);
	canUndo = $state(false);
	canRedo = $state(false);

	#history = new History<PlanFacet[]>([]);
	#measurer = new PlanMeasurer();
	#committedMeasurer = new PlanMeasurer();
	#lastProps: Omit<FacetPatch, 'label' | 'edges' | 'growthSuggestion'> = { ...DEFAULTS };
	#counter = 0;

	/** Facets with the live outline in place of the committed one. */
	readonly shown = $derived.by(() => {
		const live = this.live;
		if (!live) return this.facets;
		const i = this.facets.findIndex((f) => f.id === live.id);
		if (i < 0) return [...this.facets, { ...this.#defaults(live.id), geometry: live.geometry }];
		return this.facets.map((f, k) => (k === i ? { ...f, geometry: live.geometry } : f));
	});

	/** What the map and totals show: live while drawing or dragging. */
	readonly measured = $derived.by(() => this.#measurer.measure(this.shown));
	/** The committed plan only: what a save or a price request sends. */
	readonly measuredCommitted = $derived.by(() => this.#committedMeasurer.measure(this.facets));

	readonly selected = $derived(this.facets.find((f) => f.id === this.selectedId) ?? null);

	load(facets: PlanFacet[], meta: PlanMeta) {
		this.facets = facets.map((f) => ({ ...f, edges: [...f.edges] }));
		this.meta = meta;
		this.selectedId = null;
		this.live = null;
		this.dirty = false;
		this.#history.reset(this.facets);
		this.#syncFlags();
		const last = facets.at(-1);
		if (last) {
			this.#lastProps = {
				pitch: last.pitch,
				material: last.material,
				growth: last.growth,
				access: last.access,
				stories: last.stories
			};
		}
		this.#counter = facets.length;
	}

	/** A new facet with the last-used pitch, material and grades: houses repeat them. */
	add(geometry: Polygon, id: string): PlanFacet {
		const facet: PlanFacet = { ...this.#defaults(id), geometry };
		this.#commit([...this.facets, facet]);
		this.selectedId = id;
		this.live = null;
		return facet;
	}

	setGeometry(id: string, geometry: Polygon) {
		const f = this.facets.find((x) => x.id === id);
		if (!f) return;
		this.live = null;
		if (JSON.stringify(f.geometry.coordinates) === JSON.stringify(geometry.coordinates)) return;
		const edges = carryEdges(f.geometry.coordinates[0], f.edges, geometry.coordinates[0]);
		this.#commit(this.facets.map((x) => (x.id === id ? { ...x, geometry, edges } : x)));
	}

	update(id: string, patch: FacetPatch) {
		const f = this.facets.find((x) => x.id === id);
		if (!f) return;
		const changed = (Object.keys(patch) as (keyof FacetPatch)[]).some(
			(k) => JSON.stringify(f[k]) !== JSON.stringify(patch[k])
		);
		if (!changed) return;
		const { label: _l, edges: _e, growthSuggestion: _g, ...props } = patch;
		this.#lastProps = { ...this.#lastProps, ...props };
		this.#commit(this.facets.map((x) => (x.id === id ? { ...x, ...patch } : x)));
	}

	/** Puts a whole set of facets in place as one undoable change (a restored draft). */
	replace(facets: PlanFacet[]) {
		this.#commit(facets);
		this.selectedId = null;
		this.live = null;
	}

	/**
	 * Puts one group of facets in place of another as one undoable change: the planes made from
	 * an outline, made again each time its roof form, pitch or overhang changes. New facets take
	 * the last-used material and grades, like a drawn one.
	 */
	swapGroup(
		oldIds: readonly string[],
		next: ReadonlyArray<Pick<PlanFacet, 'id' | 'label' | 'geometry' | 'pitch' | 'edges'>>
	) {
		const keep = this.facets.filter((f) => !oldIds.includes(f.id));
		const made = next.map((f) => ({ ...this.#defaults(f.id), ...f, edges: [...f.edges] }));
		this.#commit([...keep, ...made]);
		if (this.selectedId && !this.facets.some((f) => f.id === this.selectedId)) {
			this.selectedId = null;
		}
		this.live = null;
	}

	remove(id: string) {
		if (!this.facets.some((f) => f.id === id)) return;
		this.#commit(this.facets.filter((f) => f.id !== id));
		if (this.selectedId === id) this.selectedId = null;
	}

	select(id: string | null) {
		this.selectedId = id && this.facets.some((f) => f.id === id) ? id : null;
	}

	setLive(id: string, geometry: Polygon | null) {
		this.live = geometry ? { id, geometry } : null;
	}

	undo(): boolean {
		const prev = this.#history.undo();
		if (!prev) return false;
		this.#restore(prev);
		return true;
	}

	redo(): boolean {
		const next = this.#history.redo();
		if (!next) return false;
		this.#restore(next);
		return true;
	}

	/** After a save: the plan on screen is now that version. */
	saved(version: number) {
		this.meta = { ...this.meta, baseVersion: version };
		this.dirty = false;
	}

	nextLabel(): string {
		// A lookup local to this call, never state: nothing reacts to it.
		// eslint-disable-next-line svelte/prefer-svelte-reactivity
		const used = new Set(this.facets.map((f) => f.label));
		let n = Math.max(this.#counter, this.facets.length) + 1;
		while (used.has(`Facet ${n}`)) n++;
		return `Facet ${n}`;
	}

	#defaults(id: string): Omit<PlanFacet, 'geometry'> {
		return {
			id,
			label: this.nextLabel(),
			pitch: this.#lastProps.pitch ?? DEFAULTS.pitch,
			material: this.#lastProps.material ?? DEFAULTS.material,
			growth: this.#lastProps.growth ?? DEFAULTS.growth,
			access: this.#lastProps.access ?? DEFAULTS.access,
			stories: this.#lastProps.stories ?? DEFAULTS.stories,
			edges: []
		};
	}

	#commit(next: PlanFacet[]) {
		const fixed = next.map((f) => {
			const segments = f.geometry.coordinates[0].length - 1;
			return f.edges.length === segments
				? f
				: { ...f, edges: new Array(Math.max(0, segments)).fill(null) };
		});
		this.facets = fixed;
		this.#counter = Math.max(this.#counter, fixed.length);
		this.#history.push(this.facets);
		this.dirty = true;
		this.#syncFlags();
	}

	#restore(facets: PlanFacet[]) {
		this.facets = facets;
		this.live = null;
		if (this.selectedId && !facets.some((f) => f.id === this.selectedId)) this.selectedId = null;
		this.dirty = true;
		this.#syncFlags();
	}

	#syncFlags() {
		this.canUndo = this.#history.canUndo;
		this.canRedo = this.#history.canRedo;
	}
}
