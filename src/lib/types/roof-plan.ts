import type { FacetMeasure, PlanTotals } from '../map/plan-measure';
import type { PlanFacet, PlanSource } from '../schemas/roof-plan';

/** Roof-plan shapes the API answers and the editor reads (the services build them). */

export interface RoofPlanDto {
	id: string;
	siteId: string;
	version: number;
	source: PlanSource;
	note: string;
	createdAt: string;
	createdBy: string | null;
	basedOnVersion: number | null;
	facets: PlanFacet[];
	measures: FacetMeasure[];
	totals: PlanTotals;
}

export interface VersionSummary {
	id: string;
	version: number;
	source: PlanSource;
	note: string;
	createdAt: string;
	createdBy: string | null;
	facetCount: number;
	slopedAreaFt2: number;
	squares: number;
}
