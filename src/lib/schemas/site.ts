import { z } from 'zod';
import { noNul, NUL_MESSAGE } from './form';

const optionalText = (max: number, label: string) =>
	z
		.string()
		.trim()
		.max(max, `${label} is too long (max ${max} characters).`)
		.refine(noNul, NUL_MESSAGE)
		.optional()
		.transform((v) => (v ? v : undefined));

const coord = (min: number, max: number, label: string) =>
	z.coerce
		.number({ error: `${label} must be a number.` })
		.refine(Number.isFinite, `${label} must be a number.`)
		.min(min, `${label} must be between ${min} and ${max}.`)
		.max(max, `${label} must be between ${min} and ${max}.`);

export const siteSchema = z.object({
	customerName: z
		.string()
		.trim()
		.min(1, 'Enter the customer’s name.')
		.max(120)
		.refine(noNul, NUL_MESSAGE),
	customerEmail: z
		.string()
		.trim()
		.max(254)
		.optional()
		.transform((v) => (v ? v : undefined))
		.pipe(z.email('Enter a valid e-mail address.').optional()),
	customerPhone: optionalText(40, 'Phone'),
	address: z
		.string()
		.trim()
		.min(3, 'Enter the street address.')
		.max(200)
		.refine(noNul, NUL_MESSAGE),
	lat: coord(-90, 90, 'Latitude'),
	lon: coord(-180, 180, 'Longitude'),
	notes: optionalText(2000, 'Notes'),
	gateCode: optionalText(60, 'Gate code'),
	pets: optionalText(200, 'Pets'),
	waterSource: optionalText(200, 'Water source')
});

export type SiteInput = z.infer<typeof siteSchema>;
