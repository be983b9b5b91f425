import { z } from 'zod';
import type { EstimateInput } from '../estimating/types';
import { facetIdSchema, facetListSchema } from './facet';

/**
 * Body of POST /api/estimates. Its facets are the shared facet shape (./facet.ts), the same as a
 * roof plan's. Messages name their field; issue paths (facets.2.pitch) say which one. Trade
 * refusals (roof access on tile) come from the model as EstimateInputError with the same kind
 * of path.
 */

export const MAX_EXTRAS = 50;

const required = (field: string, what: string) => (iss: { input?: unknown }) =>
	iss.input === undefined ? `${field} is required` : `${field} must be ${what}`;

const num = (field: string, min: number, max: number, what = 'a number') =>
	z
		.number({ error: required(field, what) })
		.min(min, { error: `${field} must be at least ${min}` })
		.max(max, { error: `${field} must be at most ${max}` });

/** A strict object whose type and unknown-key errors both name it. */
const strict = <S extends z.core.$ZodLooseShape>(name: string, shape: S) =>
	z.strictObject(shape, {
		error: (iss) =>
			iss.code === 'unrecognized_keys'
				? `unknown field${iss.keys.length === 1 ? '' : 's'} in ${name}: ${iss.keys.join(', ')}`
				: `${name} must be an object`
	});

export const testSpotSchema = strict('testSpot', {
	strengthPct: num('testSpot.strengthPct', 0.1, 20),
	secondsToColourChange: num('testSpot.secondsToColourChange', 0, 3600, 'a number of seconds'),
	rinsedClean: z.boolean({ error: required('testSpot.rinsedClean', 'true or false') }),
	facetIds: z
		.array(facetIdSchema, { error: 'testSpot.facetIds must be an array of facet ids' })
		.optional()
});

export const extraSchema = strict('extra', {
	label: z
		.string({ error: required('extra label', 'a string') })
		.min(1, { error: 'extra label must not be empty' })
		.max(100, { error: 'extra label must be at most 100 characters' }),
	priceCents: z
		.number({ error: required('extra priceCents', 'a number of cents') })
		.int({ error: 'extra priceCents must be whole cents' })
		.min(0, { error: 'extra priceCents must not be negative (use discountPct for discounts)' })
		.max(10_000_000, { error: 'extra priceCents must be at most 10000000' })
});

const uuid = (field: string) => z.uuid({ error: `${field} must be a UUID` });

export const estimateRequestSchema = strict('the request body', {
	facets: facetListSchema.optional(),
	siteId: uuid('siteId').optional(),
	roofPlanId: uuid('roofPlanId').optional(),
	rateCardId: uuid('rateCardId').optional(),
	stockStrengthPct: num('stockStrengthPct', 0.1, 100).optional(),
	testSpot: testSpotSchema.optional(),
	extras: z
		.array(extraSchema, { error: 'extras must be an array' })
		.max(MAX_EXTRAS, { error: `extras may list at most ${MAX_EXTRAS} items` })
		.optional(),
	discountPct: num('discountPct', 0, 100).optional(),
	measuredOnSite: z.boolean({ error: 'measuredOnSite must be true or false' }).optional(),
	siteFlags: strict('siteFlags', {
		noGutters: z.boolean({ error: 'siteFlags.noGutters must be true or false' }).optional(),
		plantsToProtect: z
			.boolean({ error: 'siteFlags.plantsToProtect must be true or false' })
			.optional()
	}).optional(),
	save: z.boolean({ error: 'save must be true or false' }).optional()
}).superRefine((body, ctx) => {
	// A roofPlanId means "price that stored plan version"; facets sent as well must be that
	// plan's (the pricing step compares them once the plan is loaded).
	if (body.facets === undefined && body.roofPlanId === undefined) {
		ctx.addIssue({
			code: 'custom',
			path: ['facets'],
			message: 'facets is required (or send roofPlanId to price a saved roof plan)'
		});
	}
	const seen = new Set(body.facets?.map((f) => f.id));
	// With a roofPlanId the facets are not known yet; the pricing step checks them with the plan's.
	if (body.facets === undefined) return;
	body.testSpot?.facetIds?.forEach((id, k) => {
		if (!seen.has(id)) {
			ctx.addIssue({
				code: 'custom',
				path: ['testSpot', 'facetIds', k],
				message: `testSpot.facetIds names unknown facet "${id}"`
			});
		}
	});
});

export type EstimateRequest = z.infer<typeof estimateRequestSchema>;

/** The model's input part of a parsed request with its facets (drops siteId, rateCardId, save…). */
export function toEstimateInput(body: EstimateRequest): EstimateInput {
	const { siteId: _s, roofPlanId: _r, rateCardId: _c, save: _v, facets, ...input } = body;
	// The pricing step fills in a roof plan's facets before it prices; none here is a slip.
	if (!facets) throw new Error('toEstimateInput needs the facets (load the roof plan first)');
	return { ...input, facets };
}

/** Issues as the API returns them: { path: 'facets.2.geometry', message }. */
export interface FieldIssue {
	path: string;
	message: string;
}

export function fieldIssues(
	issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>
): FieldIssue[] {
	return issues.map((i) => ({ path: i.path.map(String).join('.'), message: i.message }));
}
