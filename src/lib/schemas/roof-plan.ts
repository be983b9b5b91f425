import { z } from 'zod';
import { facetIssues, facetListSchema, sentFacets, type Facet } from './facet';

/**
 * Body of POST /api/roof-plans. Its facets are the shared facet shape (./facet.ts), checked the
 * same way in the editor (to warn before saving) and on the server (which decides).
 */

export const PLAN_NOTE_MAX = 500;

/** Common pitches offered as one-tap presets (rise per 12 in of run). */
export const PITCH_PRESETS = [2, 4, 6, 8, 10, 12] as const;

export const PLAN_SOURCES = ['remote', 'site_visit'] as const;
export type PlanSource = (typeof PLAN_SOURCES)[number];

/** A roof plan's facet: the shared facet shape. */
export type PlanFacet = Facet;

export const savePlanSchema = z.strictObject(
	{
		siteId: z.uuid({ error: 'siteId must be the UUID of a site' }),
		facets: facetListSchema,
		source: z
			.enum(PLAN_SOURCES, { error: `source must be one of: ${PLAN_SOURCES.join(', ')}` })
			.default('remote'),
		note: z
			.string({ error: 'note must be text' })
			.trim()
			.max(PLAN_NOTE_MAX, {
				error: `note must be at most ${PLAN_NOTE_MAX} characters`
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
);

export type SavePlanInput = z.infer<typeof savePlanSchema>;

export type PlanIssue = { path: string; message: string };

/** Zod issues as the API returns them, each facet named by number and label. */
export function planIssues(error: z.ZodError, body: unknown): PlanIssue[] {
	return facetIssues(error.issues, sentFacets(body));
}

/** One sentence for the top of a 400: the first problem, and how many more there are. */
export function summariseIssues(issues: PlanIssue[]): string {
	if (issues.length === 0) return 'The roof plan was not saved.';
	const more = issues.length > 1 ? ` (and ${issues.length - 1} more)` : '';
	return `The roof plan was not saved: ${issues[0].message}${more}.`;
}
