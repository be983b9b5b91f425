import { z } from 'zod';
import { noNul, NUL_MESSAGE } from './form';

/** An XYZ template of a licensed imagery provider, or blank for the bundled sample. */
export const imagerySchema = z.object({
	template: z
		.string()
		.trim()
		.max(500, 'Keep the template under 500 characters.')
		.refine(noNul, NUL_MESSAGE)
		.transform((v) => v || null)
		.refine(
			(v) =>
				v === null || (/^https:\/\//.test(v) && ['{z}', '{x}', '{y}'].every((p) => v.includes(p))),
			'Use an https:// URL that contains {z}, {x} and {y}, or leave it blank for the sample imagery.'
		),
	attribution: z
		.string()
		.trim()
		.max(200, 'Keep the attribution under 200 characters.')
		.refine(noNul, NUL_MESSAGE)
		.transform((v) => v || null)
});
