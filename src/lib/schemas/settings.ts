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

const optionalText = (max: number, what: string) =>
	z
		.string({ error: `Write the ${what} as text.` })
		.trim()
		.max(max, `Keep the ${what} under ${max} characters.`)
		.refine(noNul, NUL_MESSAGE)
		.transform((v) => v || null)
		.default(null);

/** The company's details printed on proposals; each may be left blank. */
export const companyContactSchema = z.object({
	phone: optionalText(40, 'phone number'),
	email: z
		.string({ error: 'Write the e-mail address as text.' })
		.trim()
		.max(254, 'An e-mail address has at most 254 characters.')
		.refine(
			(v) => v === '' || z.email().safeParse(v).success,
			'Enter an address like office@example.com, or leave it blank.'
		)
		.transform((v) => v || null)
		.default(null),
	postalAddress: optionalText(200, 'address'),
	licence: optionalText(200, 'licence and insurance line')
});
