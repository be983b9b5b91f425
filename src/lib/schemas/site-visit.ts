import { z } from 'zod';
import { accessRefusal } from '../estimating/access';
import {
	ACCESS_GRADES,
	GROWTH_GRADES,
	MATERIALS,
	MAX_PITCH_RISE,
	type AccessGrade,
	type GrowthGrade,
	type Material,
	type Stories
} from '../estimating/types';
import { OBSTACLES, type Obstacle } from '../types/site-visit';
import { NUL_MESSAGE, noNul } from './form';

/**
 * The site-visit screen's forms. Each message is written for the field it sits beside; a
 * number is refused unless it is plainly a number (no "0x1F", no "1e309", no "1,5").
 */

const DECIMAL = /^-?\d+(?:\.\d+)?$/;

const decimal = (label: string, min: number, max: number, opts: { int?: boolean } = {}) =>
	z
		.string({ error: `Enter ${label}.` })
		.trim()
		.min(1, `Enter ${label}.`)
		.refine((s) => DECIMAL.test(s), `${cap(label)} must be a number.`)
		.transform(Number)
		.pipe(
			z
				.number()
				.min(min, `${cap(label)} must be between ${min} and ${max}.`)
				.max(max, `${cap(label)} must be between ${min} and ${max}.`)
				.refine((n) => !opts.int || Number.isInteger(n), `${cap(label)} must be a whole number.`)
		);

const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

const choice = <T extends readonly [string, ...string[]]>(label: string, values: T) =>
	z.enum(values, { error: `Choose ${label}.` });

const text = (label: string, max: number) =>
	z
		.string({ error: `${label} must be text.` })
		.trim()
		.max(max, `${label} is too long (max ${max} characters).`)
		.refine(noNul, NUL_MESSAGE)
		.default('');

const facetId = z
	.string({ error: 'Choose a facet.' })
	.trim()
	.min(1, 'Choose a facet.')
	.max(64, 'Choose a facet.')
	.regex(/^[\w.:-]+$/, 'Choose a facet.');

export const visitFacetSchema = z
	.object({
		facetId,
		pitch: decimal('the pitch (rise per 12)', 0, MAX_PITCH_RISE),
		material: choice('the material', MATERIALS),
		growth: choice('a growth grade', GROWTH_GRADES),
		access: choice('an access grade', ACCESS_GRADES),
		stories: z.enum(['1', '2', '3'], { error: 'Choose 1, 2 or 3 stories.' }).transform(Number)
	})
	.superRefine((f, ctx) => {
		// The model refuses it too; here it is a message beside the access choice.
		const refused = accessRefusal(f.material, f.access);
		if (refused) ctx.addIssue({ code: 'custom', path: ['access'], message: cap(refused) + '.' });
	})
	.transform((f) => ({
		facetId: f.facetId,
		pitch: f.pitch,
		material: f.material as Material,
		growth: f.growth as GrowthGrade,
		access: f.access as AccessGrade,
		stories: f.stories as Stories
	}));
export type VisitFacetInput = z.infer<typeof visitFacetSchema>;

export const visitSiteSchema = z.object({
	obstacles: z
		.array(z.enum(OBSTACLES, { error: 'Choose obstacles from the list.' }), {
			error: 'Choose obstacles from the list.'
		})
		.max(OBSTACLES.length, 'Choose obstacles from the list.')
		.refine((a) => new Set(a).size === a.length, 'Choose each obstacle once.')
		.transform((a) => a as Obstacle[]),
	waterSource: text('Water source', 200),
	pets: text('Pets', 200),
	gateNotes: text('Gate notes', 300),
	notes: text('Notes', 2000)
});
export type VisitSiteInput = z.infer<typeof visitSiteSchema>;

export const testSpotFormSchema = z.object({
	strengthPct: decimal('the strength used (%)', 0.1, 20),
	secondsToColourChange: decimal('the seconds to colour change', 0, 3600, { int: true }),
	rinsedClean: z
		.enum(['yes', 'no'], { error: 'Say whether the spot rinsed clean.' })
		.transform((v) => v === 'yes'),
	facetIds: z
		.array(facetId, { error: 'Choose facets from the list.' })
		.max(200, 'Choose facets from the list.')
		.refine((a) => new Set(a).size === a.length, 'Choose each facet once.')
});
export type TestSpotInput = z.infer<typeof testSpotFormSchema>;

const photoId = z.uuid({ error: 'Choose a photo.' });

export const photoToggleSchema = z.object({
	photoId,
	forProposal: z.enum(['true', 'false'], { error: 'Say yes or no.' }).transform((v) => v === 'true')
});

export const photoDeleteSchema = z.object({ photoId });

/**
 * The X-Photo-Name header of an upload: the file's name, percent-encoded by the page
 * (encodeURIComponent) so any name survives a header.
 */
export const photoNameSchema = z
	.string({ error: 'Send the file name in the X-Photo-Name header.' })
	.min(1, 'Send the file name in the X-Photo-Name header.')
	.max(1024, 'The X-Photo-Name header is too long.')
	.transform((s, ctx) => {
		try {
			return decodeURIComponent(s);
		} catch {
			ctx.addIssue({ code: 'custom', message: 'X-Photo-Name must be percent-encoded UTF-8.' });
			return z.NEVER;
		}
	})
	.pipe(
		z
			.string()
			.trim()
			.min(1, 'Send the file name in the X-Photo-Name header.')
			.max(255, 'The file name is longer than 255 characters.')
			.refine(noNul, NUL_MESSAGE)
	);

/** A form's values with repeated names (checkbox groups) kept as arrays. */
export function formWithLists(
	data: FormData,
	lists: readonly string[]
): Record<string, string | string[]> {
	const out: Record<string, string | string[]> = {};
	for (const [k, v] of data) {
		if (typeof v !== 'string') continue;
		if (lists.includes(k)) ((out[k] ??= []) as string[]).push(v);
		else out[k] = v;
	}
	for (const k of lists) out[k] ??= [];
	return out;
}
