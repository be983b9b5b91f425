import type { Polygon } from 'geojson';
import { eaveLength, measureFacetPlan } from '../estimating/geometry';
import { pitchMultiplier } from '../estimating/pitch';
import type { EdgeKind } from '../estimating/types';
import { ft2ToSquares } from '../estimating/units';

/**
 * Live measurements for the editor, the site page and the roof-plan API. They use the estimating
 * model's own geometry and pitch functions, so what the editor shows while tracing is what the
 * server stores and what the estimate prices.
 */

export interface MeasurableFacet {
	id: string;
	geometry: Polygon;
	pitch: number;
	edges?: ReadonlyArray<EdgeKind | null>;
}

export type FacetMeasure =
	| {
			id: string;
			ok: true;
			planAreaFt2: number;
			pitchMultiplier: number;
			slopedAreaFt2: number;
			squares: number;
			eaveLengthFt: number;
			/** True when no edge is labelled eave and the longest unlabelled one stands in. */
			eaveEstimated: boolean;
			perimeterFt: number;
			segmentLengthsFt: number[];
	  }
	| { id: string; ok: false; problem: string };

export interface PlanTotals {
	facetCount: number;
	/** Facets whose outline cannot be measured yet (counted out of the totals). */
	unmeasured: number;
	planAreaFt2: number;
	slopedAreaFt2: number;
	squares: number;
	eaveLengthFt: number;
}

export function measureFacet(f: MeasurableFacet): FacetMeasure {
	const r = measureFacetPlan(f.geometry);
	if (!r.ok) return { id: f.id, ok: false, problem: r.issues[0]?.message ?? 'not measurable' };
	const m = pitchMultiplier(f.pitch);
	const sloped = r.plan.planAreaFt2 * m;
	const edges = f.edges && f.edges.length === r.plan.segmentLengthsFt.length ? f.edges : undefined;
	const eave = eaveLength(r.plan.segmentLengthsFt, edges);
	return {
		id: f.id,
		ok: true,
		planAreaFt2: r.plan.planAreaFt2,
		pitchMultiplier: m,
		slopedAreaFt2: sloped,
		squares: ft2ToSquares(sloped),
		eaveLengthFt: eave.eaveLengthFt,
		eaveEstimated: eave.estimated,
		perimeterFt: r.plan.perimeterFt,
		segmentLengthsFt: r.plan.segmentLengthsFt
	};
}

export function totalsOf(measures: readonly FacetMeasure[]): PlanTotals {
	const t: PlanTotals = {
		facetCount: measures.length,
		unmeasured: 0,
		planAreaFt2: 0,
		slopedAreaFt2: 0,
		squares: 0,
		eaveLengthFt: 0
	};
	for (const m of measures) {
		if (!m.ok) {
			t.unmeasured += 1;
			continue;
		}
		t.planAreaFt2 += m.planAreaFt2;
		t.slopedAreaFt2 += m.slopedAreaFt2;
		t.eaveLengthFt += m.eaveLengthFt;
	}
	t.squares = ft2ToSquares(t.slopedAreaFt2);
	return t;
}

export function measurePlan(facets: readonly MeasurableFacet[]): {
	facets: FacetMeasure[];
	totals: PlanTotals;
} {
	const measures = facets.map(measureFacet);
	return { facets: measures, totals: totalsOf(measures) };
}

/**
 * Re-measures only the facets whose geometry, pitch or edges object changed since the last call,
 * which keeps live totals cheap while one vertex is dragged on a large plan.
 */
export class PlanMeasurer {
	#cache = new Map<string, { key: MeasurableFacet; geometry: Polygon; m: FacetMeasure }>();

	measure(facets: readonly MeasurableFacet[]): { facets: FacetMeasure[]; totals: PlanTotals } {
		const next = new Map<string, { key: MeasurableFacet; geometry: Polygon; m: FacetMeasure }>();
		const out: FacetMeasure[] = new Array(facets.length);
		for (let i = 0; i < facets.length; i++) {
			const f = facets[i];
			const hit = this.#cache.get(f.id);
			const same =
				hit &&
				hit.geometry === f.geometry &&
				hit.key.pitch === f.pitch &&
				hit.key.edges === f.edges;
			const m = same ? hit.m : measureFacet(f);
			next.set(f.id, { key: f, geometry: f.geometry, m });
			out[i] = m;
		}
		this.#cache = next;
		return { facets: out, totals: totalsOf(out) };
	}
}
