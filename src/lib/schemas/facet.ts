import { z } from 'zod';
import type { Polygon } from 'geojson';
import { measureFacetPlan } from '../estimating/geometry';
import {
	ACCESS_GRADES,
	EDGE_KINDS,
	GROWTH_GRADES,
	MATERIALS,
	MAX_PITCH_RISE,
	type FacetInput
} from '../estimating/types';

/**
 * One facet shape for roof plans and estimates alike: the editor, POST /api/roof-plans and
 * POST /api/estimates all check a facet with this schema, so a facet one accepts the others
 * accept, with the same limits and the same words. Geometry is checked as well as its shape: a
 * crossing outline or a facet the size of a car park is refused with a message naming the facet.
 */

export const FACET_LIMITS = {
	maxFacets: 100,
	maxCorners: 200,
	/** About a 0.7 m square: anything smaller is a slip of the pointer, not a roof plane. */
	minAreaM2: 0.5,
	/** Larger than any one plane of a house or small commercial roof. */
	maxAreaM2: 5000,
	maxLabel: 60,
	maxId: 64
} as const;

/** A facet as plans store it and the model prices it: the label is always there (maybe ''). */
export type Facet = FacetInput & {
	label: string;
	edges: NonNullable<FacetInput['edges']>;
	growthSuggestion?: GrowthSuggestionRecord;
};

const finite = (field: string, min: number, max: number) =>
	z
		.number({
			error: (iss) =>
				iss.input === undefined
					? `${field} is required`
					: `${field} must be a finite number (got ${JSON.stringify(iss.input) ?? String(iss.input)})`
		})
		.min(min, { error: `${field} must be between ${min} and ${max}` })
		.max(max, { error: `${field} must be between ${min} and ${max}` });

/**
 * What the imagery suggested for a facet's growth grade, kept beside the grade the estimator
 * chose so the owner can see how often suggestions are kept and calibrate the thresholds.
 */
export const growthSuggestionSchema = z.strictObject(
	{
		grade: z.enum(GROWTH_GRADES, {
			error: `suggested growth grade must be one of: ${GROWTH_GRADES.join(', ')}`
		}),
		confidence: finite('suggestion confidence', 0, 1),
		measures: z.strictObject(
			{
				pixels: finite('suggestion pixel count', 0, 10_000_000),
				cleanLevel: finite('suggestion clean level', 0, 255),
				streakShare: finite('suggestion streak share', 0, 1),
				heavyShare: finite('suggestion heavy share', 0, 1),
				contrast: finite('suggestion contrast', 0, 1),
				score: finite('suggestion score', 0, 100)
			},
			{
				error: (iss) =>
					iss.code === 'unrecognized_keys'
						? `unknown field${iss.keys.length === 1 ? '' : 's'} in suggestion measures: ${iss.keys.join(', ')}`
						: 'suggestion measures must be an object'
			}
		)
	},
	{
		error: (iss) =>
			iss.code === 'unrecognized_keys'
				? `unknown field${iss.keys.length === 1 ? '' : 's'} in growth suggestion: ${iss.keys.join(', ')}`
				: 'growth suggestion must be an object with grade, confidence and measures'
	}
);
export type GrowthSuggestionRecord = z.infer<typeof growthSuggestionSchema>;

const position = z.tuple(
	[finite('longitude', -180, 180), finite('latitude', -90, 90)],
	finite('altitude', -1000, 10000),
	{ error: 'each position must be [lon, lat]' }
);

const ring = z
	.array(position, { error: 'the outline must be an array of [lon, lat] positions' })
	.min(4, {
		error: 'the outline needs at least 3 corners (4 positions, the last repeating the first)'
	})
	.max(FACET_LIMITS.maxCorners + 1, {
		error: `the outline may have at most ${FACET_LIMITS.maxCorners} corners`
	});

const polygon = z.strictObject(
	{
		type: z.literal('Polygon', { error: 'geometry type must be "Polygon"' }),
		coordinates: z
			.array(ring, { error: 'geometry coordinates must be an array with one ring' })
			.length(1, {
				error: 'geometry must have exactly one ring (holes are not supported: outline the facet)'
			}),
		// GeoJSON allows a bounding box on any geometry (RFC 7946 §5); it is checked and dropped.
		bbox: z
			.array(z.number({ error: 'geometry bbox must hold numbers' }), {
				error: 'geometry bbox must be an array of 4 or 6 numbers'
			})
			.refine((b) => b.length === 4 || b.length === 6, {
				error: 'geometry bbox must have 4 or 6 numbers'
			})
			.optional()
	},
	{
		error: (iss) =>
			iss.code === 'unrecognized_keys'
				? `unknown field${iss.keys.length === 1 ? '' : 's'} in geometry: ${iss.keys.join(', ')}`
				: 'geometry must be a GeoJSON Polygon'
	}
);

export interface GeometryProblem {
	/** Below the facet, e.g. ['geometry', 'coordinates', 0, 3]. */
	path: Array<string | number>;
	message: string;
}

/**
 * What is wrong with a facet outline, if anything: closed ring, no crossing, at least three
 * corners, within the size limits. Shape (numbers, ranges) is the schema's job; this is the
 * geometry the schema cannot see.
 */
export function facetGeometryProblems(geometry: Polygon): GeometryProblem[] {
	const r = measureFacetPlan(geometry);
	if (!r.ok) return r.issues.map((i) => ({ path: i.path, message: i.message }));
	const m2 = r.plan.planAreaM2;
	if (m2 < FACET_LIMITS.minAreaM2) {
		return [
			{
				path: ['geometry'],
				message: `the facet is only ${m2.toFixed(2)} m² in plan; the smallest allowed is ${FACET_LIMITS.minAreaM2} m²`
			}
		];
	}
	if (m2 > FACET_LIMITS.maxAreaM2) {
		return [
			{
				path: ['geometry'],
				message: `the facet is ${Math.round(m2).toLocaleString('en-US')} m² in plan; the largest allowed is ${FACET_LIMITS.maxAreaM2.toLocaleString('en-US')} m² (check the outline and the [lon, lat] order)`
			}
		];
	}
	return [];
}

/** A facet id: short, and safe in a URL, a CSS selector and a log line. */
export const facetIdSchema = z
	.string({ error: 'facet id must be a string' })
	.trim()
	.min(1, { error: 'facet id must not be empty' })
	.max(FACET_LIMITS.maxId, { error: `facet id must be at most ${FACET_LIMITS.maxId} characters` })
	.regex(/^[\w.:-]+$/, { error: 'facet id may use letters, digits and - _ . : only' });

export const facetSchema = z
	.strictObject(
		{
			id: facetIdSchema,
			label: z
				.string({ error: 'label must be text' })
				.trim()
				.max(FACET_LIMITS.maxLabel, {
					error: `label must be at most ${FACET_LIMITS.maxLabel} characters`
				})
				.default(''),
			geometry: polygon,
			pitch: finite('pitch (rise per 12)', 0, MAX_PITCH_RISE),
			material: z.enum(MATERIALS, { error: `material must be one of: ${MATERIALS.join(', ')}` }),
			growth: z.enum(GROWTH_GRADES, {
				error: `growth grade must be one of: ${GROWTH_GRADES.join(', ')}`
			}),
			access: z.enum(ACCESS_GRADES, {
				error: `access grade must be one of: ${ACCESS_GRADES.join(', ')}`
			}),
			stories: z.union([z.literal(1), z.literal(2), z.literal(3)], {
				error: 'stories must be 1, 2 or 3'
			}),
			edges: z
				.array(
					z
						.enum(EDGE_KINDS, {
							error: `each edge must be one of: ${EDGE_KINDS.join(', ')}, or null`
						})
						.nullable(),
					{ error: 'edges must be an array, one entry per outline segment' }
				)
				.optional(),
			growthSuggestion: growthSuggestionSchema.optional()
		},
		{
			error: (iss) =>
				iss.code === 'unrecognized_keys'
					? `unknown field${iss.keys.length === 1 ? '' : 's'} in facet: ${iss.keys.join(', ')}`
					: 'each facet must be an object'
		}
	)
	.superRefine((f, ctx) => {
		// Zod still runs refinements after non-fatal issues; the geometry checks need a sound shape.
		if (ctx.issues.length > 0) return;
		for (const p of facetGeometryProblems(f.geometry as Polygon)) {
			ctx.addIssue({ code: 'custom', path: p.path, message: p.message });
		}
		const segments = f.geometry.coordinates[0].length - 1;
		if (f.edges && f.edges.length !== segments) {
			ctx.addIssue({
				code: 'custom',
				path: ['edges'],
				message: `edges must give one label (or null) per outline segment: ${segments} expected, ${f.edges.length} given`
			});
		}
	})
	.transform(({ geometry, edges, ...f }): Facet => ({
		...f,
		geometry: { type: 'Polygon', coordinates: geometry.coordinates },
		edges: edges ?? new Array(geometry.coordinates[0].length - 1).fill(null)
	}));

/** A roof's facets: one to FACET_LIMITS.maxFacets, each id once. */
export const facetListSchema = z
	.array(facetSchema, { error: 'facets must be an array of facets' })
	.min(1, { error: 'facets must list at least one facet' })
	.max(FACET_LIMITS.maxFacets, {
		error: `facets may list at most ${FACET_LIMITS.maxFacets} facets`
	})
	.superRefine((facets, ctx) => {
		const seen = new Map<string, number>();
		facets.forEach((f, i) => {
			const first = seen.get(f.id);
			if (first !== undefined) {
				ctx.addIssue({
					code: 'custom',
					path: [i, 'id'],
					message: `facet id "${f.id}" is also used by facet ${first + 1}`
				});
			} else seen.set(f.id, i);
		});
	});

/** "Facet 3 (Garage south slope)": how messages name a facet, by number and label. */
export function facetName(index: number, facet: unknown): string {
	const label =
		facet && typeof facet === 'object' ? (facet as { label?: unknown }).label : undefined;
	const clean =
		typeof label === 'string' && label.trim() && label.length <= FACET_LIMITS.maxLabel
			? ` (${label.trim()})`
			: '';
	return `Facet ${index + 1}${clean}`;
}

export interface FacetIssue {
	/** Dotted, e.g. facets.2.geometry; '' for the body as a whole. */
	path: string;
	message: string;
}

/**
 * Zod or model issues as the API returns them. A message about one facet starts with that
 * facet's number and label, so "Facet 3 (Garage south slope): the outline crosses itself" reads
 * on its own. `facets` is the list as sent (labels of a list that failed to parse still help).
 */
export function facetIssues(
	issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>,
	facets: unknown
): FacetIssue[] {
	const list = Array.isArray(facets) ? (facets as unknown[]) : [];
	return issues.map((i) => {
		const path = i.path.map(String).join('.');
		if (i.path[0] === 'facets' && typeof i.path[1] === 'number') {
			return { path, message: `${facetName(i.path[1], list[i.path[1]])}: ${i.message}` };
		}
		return { path, message: i.message };
	});
}

/** The `facets` member of a body as sent, for naming facets in messages. */
export function sentFacets(body: unknown): unknown {
	return body && typeof body === 'object' ? (body as { facets?: unknown }).facets : undefined;
}

/**
 * A facet as a request body carries it: only the schema's own fields, so whatever else the
 * editor keeps on a facet never reaches a strict API.
 */
export function facetBody(f: Facet): Facet {
	return {
		id: f.id,
		label: f.label,
		geometry: f.geometry,
		pitch: f.pitch,
		material: f.material,
		growth: f.growth,
		access: f.access,
		stories: f.stories,
		edges: f.edges,
		...(f.growthSuggestion ? { growthSuggestion: f.growthSuggestion } : {})
	};
}
