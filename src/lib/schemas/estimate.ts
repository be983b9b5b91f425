import { z } from 'zod';
import type { EstimateInput } from '../estimating/types';
import {
	ACCESS_GRADES,
	EDGE_KINDS,
	GROWTH_GRADES,
	MATERIALS,
	MAX_PITCH_RISE
} from '../estimating/types';

/**
 * Body of POST /api/estimates. Messages name their field; issue paths (facets.2.pitch) say
 * which one. Geometry the schema cannot see (a self-crossing outline, zero area) and trade
 * refusals (roof access on tile) come from the model as EstimateInputError with the same kind
 * of path.
 */

export const MAX_FACETS = 200;
export const MAX_VERTICES = 500;
export const MAX_EXTRAS = 50;

const required = (field: string, what: string) => (iss: { input?: unknown }) =>
	iss.input === undefined ? `${field} is required` : `${field} must be ${what}`;

const num = (field: string, min: number, max: number, what = 'a number') =>
	z
		.number({ error: required(field, what) })
		.min(min, { error: `${field} must be at least ${min}` })
		.max(max, { error: `${field} must be at most ${max}` });

const oneOf = <T extends readonly [string, ...string[]]>(field: string, values: T) =>
	z.enum(values, {
		error: (iss) =>
			iss.input === undefined
				? `${field} is required (one of: ${values.join(', ')})`
				: `${field} must be one of: ${values.join(', ')} (got ${JSON.stringify(iss.input)})`
	});

/** A strict object whose type and unknown-key errors both name it. */
const strict = <S extends z.core.$ZodLooseShape>(name: string, shape: S) =>
	z.strictObject(shape, {
		error: (iss) =>
			iss.code === 'unrecognized_keys'
				? `unknown field${iss.keys.length === 1 ? '' : 's'} in ${name}: ${iss.keys.join(', ')}`
				: `${name} must be an object`
	});

const LON = { field: 'longitude', min: -180, max: 180 };
const LAT = { field: 'latitude', min: -90, max: 90 };
const COORDINATE_TYPE = 'a finite number (GeoJSON order is [lon, lat])';
const POSITION_TYPE = 'each position must be [lon, lat]';
const ALTITUDE_TYPE = 'altitude must be a finite number';

const coordinate = (c: typeof LON) =>
	z
		.number({ error: required(c.field, COORDINATE_TYPE) })
		.min(c.min, { error: `${c.field} must be at least ${c.min}` })
		.max(c.max, { error: `${c.field} must be at most ${c.max}` });

/** One GeoJSON position: [lon, lat], and an altitude if the source gives one. */
export const positionSchema = z.tuple(
	[coordinate(LON), coordinate(LAT)],
	z.number({ error: ALTITUDE_TYPE }),
	{ error: POSITION_TYPE }
);

const ring = z
	.array(positionSchema, { error: 'a polygon ring must be an array of [lon, lat] positions' })
	.min(4, { error: 'polygon ring needs at least 4 positions (3 corners and the closing position)' })
	.max(MAX_VERTICES + 1, { error: `polygon may have at most ${MAX_VERTICES} vertices` })
	.superRefine((r, ctx) => {
		if (ctx.issues.length > 0) return;
		const a = r[0];
		const b = r[r.length - 1];
		if (a[0] !== b[0] || a[1] !== b[1]) {
			ctx.addIssue({
				code: 'custom',
				message: 'polygon ring is not closed: the last position must repeat the first'
			});
		}
	});

export const polygonSchema = strict('polygon (a GeoJSON Polygon)', {
	type: z.literal('Polygon', { error: 'polygon type must be "Polygon"' }),
	coordinates: z.array(ring, { error: 'polygon coordinates must be an array of rings' }).length(1, {
		error: 'polygon must have exactly one ring (holes are not supported: outline the whole facet)'
	}),
	bbox: z
		.union(
			[
				z.tuple([z.number(), z.number(), z.number(), z.number()]),
				z.tuple([z.number(), z.number(), z.number(), z.number(), z.number(), z.number()])
			],
			{
				error: 'polygon bbox must have 4 or 6 numbers'
			}
		)
		.optional()
});

const idString = (field: string) =>
	z
		.string({ error: required(field, 'a string') })
		.min(1, { error: `${field} must not be empty` })
		.max(100, { error: `${field} must be at most 100 characters` });

export const facetSchema = strict('facet', {
	id: idString('facet id'),
	label: z
		.string({ error: 'label must be a string' })
		.max(100, { error: 'label must be at most 100 characters' })
		.optional(),
	polygon: polygonSchema,
	pitch: num('pitch', 0, MAX_PITCH_RISE, 'a number (rise in inches per 12 in of run)'),
	material: oneOf('material', MATERIALS),
	growth: oneOf('growth', GROWTH_GRADES),
	access: oneOf('access', ACCESS_GRADES),
	stories: z.union([z.literal(1), z.literal(2), z.literal(3)], {
		error: 'stories must be 1, 2 or 3'
	}),
	edges: z
		.array(
			z
				.enum(EDGE_KINDS, {
					error: `each edge must be one of: ${EDGE_KINDS.join(', ')}, or null when not labelled`
				})
				.nullable(),
			{
				error: `edges must be an array of ${EDGE_KINDS.join(', ')} or null, one per ring segment`
			}
		)
		.optional()
}).superRefine((f, ctx) => {
	// Zod still runs refinements after non-fatal issues (an empty ring, say): count only a sound one.
	if (ctx.issues.length > 0) return;
	const segments = f.polygon.coordinates[0].length - 1;
	if (f.edges && f.edges.length !== segments) {
		ctx.addIssue({
			code: 'custom',
			path: ['edges'],
			message: `edges must give one label (or null) per ring segment: ${segments} expected, ${f.edges.length} given`
		});
	}
});

export const testSpotSchema = strict('testSpot', {
	strengthPct: num('testSpot.strengthPct', 0.1, 20),
	secondsToColourChange: num('testSpot.secondsToColourChange', 0, 3600, 'a number of seconds'),
	rinsedClean: z.boolean({ error: required('testSpot.rinsedClean', 'true or false') }),
	facetIds: z.array(idString('testSpot facet id')).optional()
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
	facets: z
		.array(facetSchema, { error: 'facets must be an array of facets' })
		.min(1, { error: 'facets must list at least one facet' })
		.max(MAX_FACETS, { error: `facets may list at most ${MAX_FACETS} facets` })
		.optional(),
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
	const seen = new Set<string>();
	body.facets?.forEach((f, i) => {
		if (seen.has(f.id)) {
			ctx.addIssue({
				code: 'custom',
				path: ['facets', i, 'id'],
				message: `facet id "${f.id}" is used twice`
			});
		}
		seen.add(f.id);
	});
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
export type FacetRequest = z.infer<typeof facetSchema>;

/** The model's input part of a parsed request with its facets (drops siteId, rateCardId, save…). */
export function toEstimateInput(body: EstimateRequest): EstimateInput {
	const { siteId: _s, roofPlanId: _r, rateCardId: _c, save: _v, facets, ...input } = body;
	// The pricing step fills in a roof plan's facets before it prices; none here is a slip.
	if (!facets) throw new Error('toEstimateInput needs the facets (load the roof plan first)');
	return { ...input, facets };
}

/** Issues as the API returns them: { path: 'facets.2.polygon', message }. */
export interface FieldIssue {
	path: string;
	message: string;
}

export function fieldIssues(
	issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>
): FieldIssue[] {
	return issues.map((i) => ({ path: i.path.map(String).join('.'), message: i.message }));
}
