import { z } from 'zod';
import { ACCESS_GRADES, GROWTH_GRADES, MATERIALS, type EstimateResult } from '../estimating/types';
import { rateCardSchema } from './rate-card';
import { ESTIMATE_STATUSES } from '../estimate-status';
import { pageNumber, searchText, wholeNumber } from './list-query';

/**
 * Query, PATCH and response schemas of the estimates API. The request body schema lives in
 * $lib/schemas/estimate.ts (the model's engineer owns it); the OpenAPI document is generated
 * from both, so what it says is what the code checks.
 */

const statusEnum = z.enum(ESTIMATE_STATUSES, {
	error: (iss) =>
		iss.input === undefined
			? `status is required (one of: ${ESTIMATE_STATUSES.join(', ')})`
			: `status must be one of: ${ESTIMATE_STATUSES.join(', ')} (got ${JSON.stringify(iss.input)})`
});

export const MAX_PAGE_SIZE = 100;

export const estimateListQuerySchema = z.object({
	status: statusEnum.optional().describe('Only estimates with this status.'),
	site: z.uuid({ error: 'site must be a site id (UUID)' }).optional().describe('Only this site.'),
	text: searchText('text'),
	page: pageNumber(),
	pageSize: wholeNumber('pageSize', 1, MAX_PAGE_SIZE, 20).describe(
		`Items per page, at most ${MAX_PAGE_SIZE}.`
	)
});

export const estimatePatchSchema = z.strictObject(
	{ status: statusEnum },
	{
		error: (iss) =>
			iss.code === 'unrecognized_keys'
				? `only status can be changed (unknown: ${iss.keys.join(', ')})`
				: 'the request body must be an object like {"status": "ready"}'
	}
);

// ---- responses (documentation and tests; the handlers build them from typed results) ----

const lineItem = z.object({
	code: z.string(),
	label: z.string(),
	detail: z.string(),
	amountCents: z.int(),
	facetId: z.string().optional()
});

const note = z.object({
	code: z.string(),
	message: z.string(),
	facetIds: z.array(z.string()).optional(),
	facets: z
		.array(z.string())
		.optional()
		.describe('The same facets by name: the label given, or "Facet 2" for an unlabelled one.'),
	path: z.string().optional().describe('Input field the note is about, e.g. facets.2.edges.')
});

const facetResult = z.object({
	id: z.string(),
	label: z.string().optional(),
	material: z.enum(MATERIALS),
	growth: z.enum(GROWTH_GRADES),
	access: z.enum(ACCESS_GRADES),
	stories: z.union([z.literal(1), z.literal(2), z.literal(3)]),
	pitch: z.number().describe('Rise in inches per 12 in of run.'),
	planAreaFt2: z.number().describe('Top-down (plan) area, ft².'),
	pitchMultiplier: z.number().describe('√(1 + (rise/12)²).'),
	slopedAreaFt2: z.number().describe('Plan area × pitch multiplier, ft².'),
	squares: z.number().describe('Sloped area ÷ 100 ft².'),
	mixStrengthPct: z.number(),
	suggestedStrengthPct: z.number(),
	applications: z.int(),
	coverageGalPerSquare: z.number(),
	mixGal: z.number().describe('Finished mix for this facet before the waste allowance, US gal.'),
	eaveLengthFt: z.number(),
	eaveEstimated: z.boolean(),
	perimeterFt: z.number(),
	ladderPlacements: z.int(),
	labourHours: z.number(),
	steep: z.boolean(),
	priceCents: z.int()
});

const batch = z.object({
	strengthPct: z.number(),
	mixGal: z.number().describe('Finished mix, waste allowance included, US gal.'),
	stockGal: z.number().describe('Sodium hypochlorite stock, by C1·V1 = C2·V2.'),
	waterGal: z.number(),
	surfactantOz: z.number().describe('US fl oz.'),
	facetIds: z.array(z.string())
});

export const estimateResultSchema = z.object({
	facets: z.array(facetResult),
	totals: z.object({
		planAreaFt2: z.number(),
		slopedAreaFt2: z.number(),
		squares: z.number(),
		eaveLengthFt: z.number(),
		perimeterFt: z.number()
	}),
	chemistry: z.object({
		batches: z.array(batch),
		stockStrengthPct: z.number(),
		wastePct: z.number(),
		preWetGal: z.number(),
		rinseGal: z.number(),
		totalMixGal: z.number(),
		totalStockGal: z.number(),
		totalSurfactantOz: z.number(),
		dwellMinutes: z
			.number()
			.describe("Longest a coat may dwell, minutes: the card's setting, at most 15.")
	}),
	labour: z.object({
		hours: z.number().describe('Crew hours on site.'),
		technicianHours: z.number(),
		crewSize: z.int(),
		costCents: z.int(),
		lineItems: z.array(lineItem.extend({ hours: z.number() }))
	}),
	price: z.object({
		subtotalCents: z.int(),
		minimumAdjustmentCents: z.int(),
		discountCents: z.int(),
		discountPct: z.number(),
		preTaxCents: z.int(),
		taxCents: z.int(),
		totalCents: z.int(),
		lowCents: z.int(),
		highCents: z.int(),
		depositCents: z.int(),
		measuredOnSite: z.boolean(),
		lineItems: z.array(lineItem).describe('They add up to totalCents exactly.')
	}),
	cost: z.object({
		chemicalCents: z.int(),
		labourCents: z.int(),
		overheadCents: z.int(),
		totalCents: z.int(),
		lineItems: z.array(lineItem)
	}),
	marginPct: z.number(),
	expectations: z.array(note),
	warnings: z.array(note)
}) satisfies z.ZodType<EstimateResult>;

const rateCardRef = z.object({ id: z.uuid(), version: z.int() });

export const estimatePricedSchema = estimateResultSchema.extend({
	rateCard: rateCardRef.describe('The rate-card version the price comes from.'),
	estimate: z
		.object({ id: z.uuid(), status: statusEnum })
		.optional()
		.describe('Present when the request had "save": true.')
});

export const estimateListItemSchema = z.object({
	id: z.uuid(),
	status: statusEnum,
	siteId: z.uuid().nullable(),
	address: z.string().nullable(),
	customerName: z.string().nullable(),
	totalCents: z.int(),
	squares: z.number(),
	rateCardVersion: z.int(),
	createdAt: z.iso.datetime(),
	updatedAt: z.iso.datetime()
});

export const estimateListSchema = z.object({
	items: z.array(estimateListItemSchema),
	total: z.int(),
	page: z.int(),
	pageSize: z.int()
});

export const estimateDetailSchema = z.object({
	id: z.uuid(),
	status: statusEnum,
	siteId: z.uuid().nullable(),
	roofPlanId: z.uuid().nullable(),
	site: z.object({ address: z.string(), customerName: z.string() }).nullable(),
	rateCard: rateCardRef,
	input: z.record(z.string(), z.unknown()).describe('The request it was priced with, frozen.'),
	result: estimateResultSchema.describe('The priced result, frozen.'),
	totalCents: z.int(),
	createdBy: z.string().nullable(),
	createdAt: z.iso.datetime(),
	updatedAt: z.iso.datetime(),
	nextStatuses: z.array(statusEnum).describe('Statuses your role may move it to now.')
});

export const rateCardListSchema = z.object({
	items: z.array(
		z.object({
			id: z.uuid(),
			version: z.int(),
			isDefault: z.boolean(),
			note: z.string(),
			createdBy: z.string().nullable(),
			createdAt: z.iso.datetime(),
			card: rateCardSchema
		})
	)
});

export const apiErrorSchema = z.object({
	message: z.string(),
	issues: z
		.array(
			z.object({
				path: z.string().describe("Dotted field path, e.g. facets.0.pitch; '' for the body."),
				message: z.string()
			})
		)
		.optional(),
	errorId: z.string().optional()
});
