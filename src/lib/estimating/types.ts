import type { Polygon } from 'geojson';

export const MATERIALS = [
	'asphalt_shingle',
	'clay_tile',
	'concrete_tile',
	'metal',
	'slate',
	'wood_shake'
] as const;
export type Material = (typeof MATERIALS)[number];

export function isMaterial(v: unknown): v is Material {
	switch (v) {
		case 'asphalt_shingle':
		case 'clay_tile':
		case 'concrete_tile':
		case 'metal':
		case 'slate':
		case 'wood_shake':
			return true;
		default:
			return false;
	}
}

/** Clearpitch's growth grades: G0 clean … G4 severe with lichen or moss. */
export const GROWTH_GRADES = ['G0', 'G1', 'G2', 'G3', 'G4'] as const;
export type GrowthGrade = (typeof GROWTH_GRADES)[number];

export function isGrowthGrade(v: unknown): v is GrowthGrade {
	return v === 'G0' || v === 'G1' || v === 'G2' || v === 'G3' || v === 'G4';
}

/** Clearpitch's access grades. */
export const ACCESS_GRADES = ['ground', 'ladder', 'roof', 'lift'] as const;
export type AccessGrade = (typeof ACCESS_GRADES)[number];

export function isAccessGrade(v: unknown): v is AccessGrade {
	return v === 'ground' || v === 'ladder' || v === 'roof' || v === 'lift';
}

export const EDGE_KINDS = ['eave', 'rake', 'ridge', 'hip', 'valley'] as const;
export type EdgeKind = (typeof EDGE_KINDS)[number];

export const STORIES = [1, 2, 3] as const;
export type Stories = (typeof STORIES)[number];

export const MAX_PITCH_RISE = 24;

export interface FacetInput {
	id: string;
	label?: string;
	/** WGS84 GeoJSON Polygon, positions [lon, lat]; one outer ring, no holes. */
	geometry: Polygon;
	/** Rise in inches per 12 in of run, 0..24. */
	pitch: number;
	material: Material;
	growth: GrowthGrade;
	access: AccessGrade;
	stories: Stories;
	/** One label per ring segment (segment i runs from position i to i+1); null = not labelled. */
	edges?: Array<EdgeKind | null>;
}

export interface TestSpot {
	strengthPct: number;
	secondsToColourChange: number;
	rinsedClean: boolean;
	/** Facets the spot speaks for; all facets when omitted. */
	facetIds?: string[];
}

export interface Extra {
	label: string;
	priceCents: number;
}

export interface SiteFlags {
	noGutters?: boolean;
	plantsToProtect?: boolean;
}

export interface EstimateInput {
	facets: FacetInput[];
	/** Tested strength of the stock on hand (trade %); the rate card's default when omitted. */
	stockStrengthPct?: number;
	testSpot?: TestSpot;
	extras?: Extra[];
	/** Requested discount; capped by the rate card's maxDiscountPct. */
	discountPct?: number;
	/** True once a site visit confirmed the plan; narrows the price range. Default false. */
	measuredOnSite?: boolean;
	siteFlags?: SiteFlags;
}

export interface LineItem {
	code: string;
	label: string;
	detail: string;
	amountCents: number;
	facetId?: string;
}

export interface LabourLineItem extends LineItem {
	/** Crew hours (elapsed time on site) this item adds. */
	hours: number;
}

export interface Note {
	code: string;
	message: string;
	facetIds?: string[];
	/** The same facets as people read them: their labels, or "Facet 2" for an unlabelled one. */
	facets?: string[];
	/** Field path like "facets.2.edges", when the note is about one input field. */
	path?: string;
}

export interface FacetResult {
	id: string;
	label?: string;
	material: Material;
	growth: GrowthGrade;
	access: AccessGrade;
	stories: Stories;
	pitch: number;
	planAreaFt2: number;
	pitchMultiplier: number;
	slopedAreaFt2: number;
	squares: number;
	mixStrengthPct: number;
	/** Strength before the test spot adjusted it. */
	suggestedStrengthPct: number;
	applications: number;
	coverageGalPerSquare: number;
	/** Mix before the waste allowance. */
	mixGal: number;
	eaveLengthFt: number;
	eaveEstimated: boolean;
	perimeterFt: number;
	ladderPlacements: number;
	/** Crew hours spent applying on this facet, ladder set-ups included. */
	labourHours: number;
	steep: boolean;
	priceCents: number;
}

export interface Batch {
	strengthPct: number;
	/** Finished mix, waste allowance included. */
	mixGal: number;
	stockGal: number;
	waterGal: number;
	surfactantOz: number;
	facetIds: string[];
}

export interface ChemistryResult {
	batches: Batch[];
	stockStrengthPct: number;
	wastePct: number;
	preWetGal: number;
	rinseGal: number;
	totalMixGal: number;
	totalStockGal: number;
	totalSurfactantOz: number;
	/** Longest a coat may dwell, from the card, never over the trade's ceiling. */
	dwellMinutes: number;
}

export interface LabourResult {
	/** Crew hours: elapsed time on site with the whole crew working. */
	hours: number;
	/** Technician (person) hours = crew hours × crew size; what wages are paid on. */
	technicianHours: number;
	crewSize: number;
	costCents: number;
	lineItems: LabourLineItem[];
}

export interface PriceResult {
	/** Work before minimum charge, discount and tax. */
	subtotalCents: number;
	minimumAdjustmentCents: number;
	discountCents: number;
	discountPct: number;
	/** Price the customer pays before tax: subtotal + minimum adjustment − discount. */
	preTaxCents: number;
	taxCents: number;
	totalCents: number;
	lowCents: number;
	highCents: number;
	depositCents: number;
	measuredOnSite: boolean;
	/** Adds up to totalCents exactly (discount lines are negative). */
	lineItems: LineItem[];
}

export interface CostResult {
	chemicalCents: number;
	labourCents: number;
	overheadCents: number;
	totalCents: number;
	lineItems: LineItem[];
}

export interface Totals {
	planAreaFt2: number;
	slopedAreaFt2: number;
	squares: number;
	eaveLengthFt: number;
	perimeterFt: number;
}

export interface EstimateResult {
	facets: FacetResult[];
	totals: Totals;
	chemistry: ChemistryResult;
	labour: LabourResult;
	price: PriceResult;
	cost: CostResult;
	/** (pre-tax price − cost) ÷ pre-tax price × 100; 0 when the price is 0. */
	marginPct: number;
	expectations: Note[];
	warnings: Note[];
}
