import type { PlanFacet } from '../schemas/roof-plan';
import type { FacetMeasure } from './plan-measure';

/** The editor's facets as the estimate API takes them: only those whose outline measures. */
export function estimateFacets(facets: readonly PlanFacet[], measures: readonly FacetMeasure[]) {
	return facets
		.filter((_, i) => measures[i]?.ok)
		.map((f) => ({
			id: f.id,
			...(f.label ? { label: f.label } : {}),
			polygon: f.geometry,
			pitch: f.pitch,
			material: f.material,
			growth: f.growth,
			access: f.access,
			stories: f.stories,
			edges: f.edges
		}));
}

export type EstimateFacet = ReturnType<typeof estimateFacets>[number];

export type SaveEstimateInput = {
	siteId: string;
	roofPlanId: string;
	measuredOnSite: boolean;
	facets: EstimateFacet[];
};

/** A live price for the plan as drawn; nothing is stored. */
export function priceBody(p: Omit<SaveEstimateInput, 'roofPlanId'>) {
	return { facets: p.facets, siteId: p.siteId, measuredOnSite: p.measuredOnSite };
}

/**
 * What "Save estimate" sends. Once the API prices a saved plan from its id, this becomes
 * `{ siteId: p.siteId, roofPlanId: p.roofPlanId, save: true }`.
 */
export function saveEstimateBody(p: SaveEstimateInput) {
	return { ...priceBody(p), roofPlanId: p.roofPlanId, save: true };
}

export async function postEstimate(body: object, signal?: AbortSignal) {
	const r = await fetch('/api/estimates', {
		method: 'POST',
		headers: { 'content-type': 'application/json', accept: 'application/json' },
		body: JSON.stringify(body),
		signal
	});
	const data = await r.json().catch(() => ({}));
	return { status: r.status, data };
}

/** Saves an estimate of a saved roof-plan version. */
export const saveEstimate = (p: SaveEstimateInput) => postEstimate(saveEstimateBody(p));
