import type { Polygon } from 'geojson';
import type { PlanFacet } from '../schemas/roof-plan';
import type { Imagery } from './imagery';

/**
 * What the roof editor needs from a map, whichever library draws it: MapLibre with
 * mapbox-gl-draw where WebGL2 works, Leaflet with geoman where it doesn't.
 */
export interface EditorMap {
	readonly kind: 'maplibre' | 'leaflet';
	/** Redraws every facet from the editor state (after undo, a load or a property change). */
	setFacets(facets: readonly PlanFacet[], selectedId: string | null): void;
	/** Labels shown on the map at each facet. */
	setLabels(labels: readonly FacetLabel[]): void;
	select(id: string | null): void;
	/** Highlights one outline segment of the selected facet (edge labelling), or none. */
	highlightEdge(facetId: string | null, segment: number | null): void;
	startDrawing(): void;
	/** Finishes the polygon being drawn (same as Enter). */
	finishDrawing(): void;
	/** Drops the polygon being drawn (same as Escape). */
	cancelDrawing(): void;
	/** While drawing: removes the last corner placed. False when there is none. */
	removeLastCorner(): boolean;
	/** While drawing: places a corner at the centre crosshair (keyboard drawing). */
	placeCornerAtCentre(): void;
	/** Edit corners of the selected facet; `step` moves the keyboard's chosen corner. */
	editCorners(step?: 1 | -1): void;
	/** Moves the selected corner, or else the selected facet, by screen pixels. */
	nudge(dxPx: number, dyPx: number): boolean;
	/** Deletes the selected corner if one is chosen, else reports the facet for deletion. */
	deleteSelection(): 'corner' | 'facet' | 'none';
	setSnapping(on: boolean): void;
	/**
	 * Buttons on the sides of a traced outline, so a gable end is chosen by tapping its side;
	 * null takes them away.
	 */
	showOutlineSides(sides: readonly OutlineSideMark[] | null, onpick: (side: number) => void): void;
	readonly drawing: boolean;
	fitTo(facets: readonly PlanFacet[]): void;
	/** The focusable map surface, for keyboard users. */
	focus(): void;
	destroy(): void;
}

export interface FacetLabel {
	id: string;
	/** The outline as shown now (live while it is dragged). */
	geometry: Polygon;
	text: string;
	detail: string;
	growth: PlanFacet['growth'];
}

export interface OutlineSideMark {
	/** Middle of the side, [lon, lat]. */
	at: [number, number];
	text: string;
	/** Accessible name, e.g. "Side 2 ends in a gable". */
	label: string;
	pressed: boolean;
}

/** One button per side; the same element whichever map draws it (text only, never HTML). */
export function sideButton(mark: OutlineSideMark, onpick: () => void): HTMLButtonElement {
	const b = document.createElement('button');
	b.type = 'button';
	b.className = 'cp-side-button';
	b.textContent = mark.text;
	b.setAttribute('aria-label', mark.label);
	b.setAttribute('aria-pressed', String(mark.pressed));
	for (const ev of ['mousedown', 'touchstart', 'pointerdown', 'dblclick'] as const) {
		// The map must not start a pan or a selection under the button.
		b.addEventListener(ev, (e) => e.stopPropagation());
	}
	b.addEventListener('click', (e) => {
		e.stopPropagation();
		onpick();
	});
	return b;
}

export interface EditorMapEvents {
	/** A polygon was finished; returns nothing: the state gives it its id. */
	onCreate(id: string, geometry: Polygon): void;
	onChange(id: string, geometry: Polygon): void;
	onDelete(id: string): void;
	onSelect(id: string | null): void;
	/** Outline being drawn or dragged; null when the gesture ended. */
	onLive(id: string, geometry: Polygon | null): void;
	onModeChange(mode: 'browse' | 'draw' | 'corners'): void;
}

export interface EditorMapOptions {
	container: HTMLElement;
	imagery: Imagery;
	center: [number, number];
	readOnly: boolean;
	events: EditorMapEvents;
}

/** What browser tests read from `window.__clearpitchMap`. */
export interface MapTestHandle {
	kind: 'maplibre' | 'leaflet';
	/** Page (client) pixel of a [lon, lat]. */
	project(lonLat: [number, number]): { x: number; y: number };
	/** Fits the view to [west, south, east, north]; resolves when the map has settled. */
	fitBounds(bbox: [number, number, number, number], paddingPx?: number): Promise<void>;
	zoom(): number;
	/** ms since navigation start when the map had drawn its first view (for the benchmark). */
	readyAt: number;
}

declare global {
	interface Window {
		__clearpitchMap?: MapTestHandle;
	}
}

/** MapLibre needs WebGL2; some kiosks, old tablets and locked-down browsers lack it. */
export function hasWebGL2(): boolean {
	try {
		const c = document.createElement('canvas');
		return !!c.getContext('webgl2');
	} catch {
		return false;
	}
}
