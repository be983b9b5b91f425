import { z } from 'zod';
import type { Polygon } from 'geojson';
import { measureFacetPlan } from '../estimating/geometry';
import {
	ACCESS_GRADES,
	EDGE_KINDS,
	GROWTH_GRADES,
	MATERIALS,
	MAX_PITCH_RISE,
	type AccessGrade,
	type EdgeKind,
	type GrowthGrade,
	type Material,
	type Stories
} from '../estimating/types';

/**
 * Body of POST /api/roof-plans, and the facet shape the editor keeps. The same schema runs in the
 * editor (to warn before saving) and on the server (which decides). Geometry is checked here as
 * well as its shape: a plan with a crossing outline or a facet the size of a car park is refused
 * with a message that names the facet.
 */

export const PLAN_LIMITS = {
	maxFacets: 100,
	maxVerticesPerFacet: 200,
	/** About a 0.7 m square: anything smaller is a slip of the pointer, not a roof plane. */
	minFacetAreaM2: 0.5,
	/** Larger than any one plane of a house or small commercial roof. */
	maxFacetAreaM2: 5000,
	maxLabel: 60,
	maxNote: 500
} as const;

/** Common pitches offered as one-tap presets (rise per 12 in of run). */
export const PITCH_PRESETS = [2, 4, 6, 8, 10, 12] as const;

export const PLAN_SOURCES = ['remote', 'site_visit'] as const;
export type PlanSource = (typeof PLAN_SOURCES)[number];

export interface PlanFacet {
	id: string;
	label: string;
	geometry: Polygon;
	/** Rise in inches per 12 in of run. */
	pitch: number;
	material: Material;
	growth: GrowthGrade;
	access: AccessGrade;
	stories: Stories;
	/** One per ring segment (segment i runs from position i to i+1); null = not labelled. */
	edges: Array<EdgeKind | null>;
}

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
	.max(PLAN_LIMITS.maxVerticesPerFacet + 1, {
		error: `the outline may have at most ${PLAN_LIMITS.maxVerticesPerFacet} corners`
	});

const polygon = z.strictObject(
	{
		type: z.literal('Polygon', { error: 'geometry type must be "Polygon"' }),
		coordinates: z
			.array(ring, { error: 'geometry coordinates must be an array with one ring' })
			.length(1, {
				error: 'geometry must have exactly one ring (holes are not supported: outline the facet)'
			})
	},
	{ error: 'geometry must be a GeoJSON Polygon' }
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
	if (!r.ok) {
		return r.issues.map((i) => ({
			path: i.path.map((p) => (p === 'polygon' ? 'geometry' : p)),
			message: plainWords(i.message)
		}));
	}
	const m2 = r.plan.planAreaM2;
	if (m2 < PLAN_LIMITS.minFacetAreaM2) {
		return [
			{
				path: ['geometry'],
				message: `the facet is only ${m2.toFixed(2)} m² in plan; the smallest allowed is ${PLAN_LIMITS.minFacetAreaM2} m²`
			}
		];
	}
	if (m2 > PLAN_LIMITS.maxFacetAreaM2) {
		return [
			{
				path: ['geometry'],
				message: `the facet is ${Math.round(m2).toLocaleString('en-US')} m² in plan; the largest allowed is ${PLAN_LIMITS.maxFacetAreaM2.toLocaleString('en-US')} m² (check the outline and the [lon, lat] order)`
			}
		];
	}
	return [];
}

/** The model speaks of "polygon rings"; the editor's users draw outlines. */
function plainWords(message: string): string {
	return message.replace(/^polygon (ring |outline )?/, 'the outline ');
}

export const planFacetSchema = z
	.strictObject(
		{
			id: z
				.string({ error: 'facet id must be a string' })
				.trim()
				.min(1, { error: 'facet id must not be empty' })
				.max(64, { error: 'facet id must be at most 64 characters' })
				.regex(/^[\w.:-]+$/, { error: 'facet id may use letters, digits and - _ . : only' }),
			label: z
				.string({ error: 'label must be text' })
				.trim()
				.max(PLAN_LIMITS.maxLabel, {
					error: `label must be at most ${PLAN_LIMITS.maxLabel} characters`
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
				.optional()
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
	.transform((f): PlanFacet => ({
		...f,
		geometry: f.geometry as Polygon,
		edges: f.edges ?? new Array(f.geometry.coordinates[0].length - 1).fill(null)
	}));

export const savePlanSchema = z
	.strictObject(
		{
			siteId: z.uuid({ error: 'siteId must be the UUID of a site' }),
			facets: z
				.array(planFacetSchema, { error: 'facets must be an array of facets' })
				.min(1, { error: 'a roof plan needs at least one facet' })
				.max(PLAN_LIMITS.maxFacets, {
					error: `a roof plan may have at most ${PLAN_LIMITS.maxFacets} facets`
				}),
			source: z
				.enum(PLAN_SOURCES, { error: `source must be one of: ${PLAN_SOURCES.join(', ')}` })
				.default('remote'),
			note: z
				.string({ error: 'note must be text' })
				.trim()
				.max(PLAN_LIMITS.maxNote, {
					error: `note must be at most ${PLAN_LIMITS.maxNote} characters`
				})
				.default(''),
			/** The version the editor started from (null for a first plan); a stale one is a 409. */
			baseVersion: z
				.number({ error: 'baseVersion must be a version number or null' })
				.int({ error: 'baseVersion must be a whole number' })
				.min(1, { error: 'baseVersion must be 1 or more' })
				.nullable()
				.optional(),
			/** Set when this plan is a copy of an earlier version (a site-visit copy, a restore). */
			basedOnVersion: z
				.number({ error: 'basedOnVersion must be a version number or null' })
				.int({ error: 'basedOnVersion must be a whole number' })
				.min(1, { error: 'basedOnVersion must be 1 or more' })
				.nullable()
				.optional()
		},
		{
			error: (iss) =>
				iss.code === 'unrecognized_keys'
					? `unknown field${iss.keys.length === 1 ? '' : 's'}: ${iss.keys.join(', ')}`
					: 'the body must be a JSON object'
		}
	)
	.superRefine((body, ctx) => {
		const seen = new Map<string, number>();
		body.facets.forEach((f, i) => {
			const first = seen.get(f.id);
			if (first !== undefined) {
				ctx.addIssue({
					code: 'custom',
					path: ['facets', i, 'id'],
					message: `facet id "${f.id}" is also used by facet ${first + 1}`
				});
			} else seen.set(f.id, i);
		});
	});

export type SavePlanInput = z.infer<typeof savePlanSchema>;

export interface PlanIssue {
	path: string;
	message: string;
}

/**
 * Zod issues as the API returns them. A message about one facet starts with that facet's number
 * and label, so "Facet 3 (Garage south slope): the outline crosses itself" reads on its own.
 */
export function planIssues(error: z.ZodError, body: unknown): PlanIssue[] {
	const facets =
		body && typeof body === 'object' && Array.isArray((body as { facets?: unknown }).facets)
			? ((body as { facets: unknown[] }).facets as unknown[])
			: [];
	return error.issues.map((i) => {
		const path = i.path.map(String).join('.');
		if (i.path[0] === 'facets' && typeof i.path[1] === 'number') {
			return { path, message: `${facetName(i.path[1], facets[i.path[1]])}: ${i.message}` };
		}
		return { path, message: i.message };
	});
}

export function facetName(index: number, facet: unknown): string {
	const label =
		facet && typeof facet === 'object' ? (facet as { label?: unknown }).label : undefined;
	const clean =
		typeof label === 'string' && label.trim() && label.length <= PLAN_LIMITS.maxLabel
			? ` (${label.trim()})`
			: '';
	return `Facet ${index + 1}${clean}`;
}

/** One sentence for the top of a 400: the first problem, and how many more there are. */
export function summariseIssues(issues: PlanIssue[]): string {
	if (issues.length === 0) return 'The roof plan was not saved.';
	const more = issues.length > 1 ? ` (and ${issues.length - 1} more)` : '';
	return `The roof plan was not saved: ${issues[0].message}${more}.`;
}
