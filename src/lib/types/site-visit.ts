import type { PlanFacet } from '../schemas/roof-plan';

/** What can stand in the crew's way around a house; each code has its plain label. */
export const OBSTACLES = [
	'fence',
	'shrubs_beds',
	'power_line',
	'no_gutters',
	'pond_pool',
	'storm_drain',
	'vehicle'
] as const;
export type Obstacle = (typeof OBSTACLES)[number];

export const OBSTACLE_LABELS: Record<Obstacle, string> = {
	fence: 'Fence',
	shrubs_beds: 'Shrubs or beds',
	power_line: 'Power line',
	no_gutters: 'No gutters',
	pond_pool: 'Pond or pool',
	storm_drain: 'Storm drain',
	vehicle: 'Vehicle'
};

/** The fields a visit may correct on a facet. */
export type FacetFields = Pick<PlanFacet, 'pitch' | 'material' | 'growth' | 'access' | 'stories'>;

/** A facet as the visit has it: the plan's facet with the corrections, and what it was. */
export interface VisitFacet extends PlanFacet {
	/** Looked at on site (as measured, or corrected). */
	checked: boolean;
	/** The remote plan's values, to show what the visit changed. */
	remote: FacetFields;
}

export interface TestSpotLog {
	strengthPct: number;
	secondsToColourChange: number;
	rinsedClean: boolean;
	/** Empty: the spot stands for every facet. */
	facetIds: string[];
}

export interface VisitDto {
	id: string;
	estimateId: string;
	siteId: string;
	basePlanVersion: number | null;
	facets: VisitFacet[];
	obstacles: Obstacle[];
	waterSource: string;
	pets: string;
	gateNotes: string;
	notes: string;
	testSpot: TestSpotLog | null;
	confirmedAt: string | null;
	confirmedBy: string | null;
	confirmedPlanVersion: number | null;
	/** Changes so far; a confirmation names the one it saw. */
	revision: number;
}

export interface PhotoDto {
	id: string;
	fileName: string;
	width: number;
	height: number;
	lat: number | null;
	lon: number | null;
	takenAt: string | null;
	forProposal: boolean;
	createdAt: string;
}

/** Renditions a photo is served in (/photos/[id]/[rendition]). */
export const PHOTO_RENDITIONS = ['display', 'thumb'] as const;
export type PhotoRendition = (typeof PHOTO_RENDITIONS)[number];

/** Which facet-field differences from the remote plan a visit facet carries. */
export function correctedFields(f: VisitFacet): (keyof FacetFields)[] {
	return (['pitch', 'material', 'growth', 'access', 'stories'] as const).filter(
		(k) => f[k] !== f.remote[k]
	);
}
