import { facetBody } from '../schemas/facet';
import type { PlanFacet } from '../schemas/roof-plan';
import type { FacetMeasure } from './plan-measure';

/** The editor's facets as the estimate API takes them: only those whose outline measures. */
export function estimateFacets(facets: readonly PlanFacet[], measures: readonly FacetMeasure[]) {
	return facets.filter((_, i) => measures[i]?.ok).map(facetBody);
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
 * What "Save estimate" sends: the saved plan's id, not its facets. The server loads that
 * version's facets itself, so the estimate is always of the plan as stored.
 */
export function saveEstimateBody(p: Omit<SaveEstimateInput, 'facets'>) {
	return {
		siteId: p.siteId,
		roofPlanId: p.roofPlanId,
		measuredOnSite: p.measuredOnSite,
		save: true
	};
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
