import { z } from 'zod';
import { noNul, NUL_MESSAGE } from './form';

/**
 * The columns of the customers and sites files, in the order export writes them. An import must
 * have each of them once, in any order; `*_ref` ties a site to its customer inside the files.
 */
export const CUSTOMER_COLUMNS = ['customer_ref', 'name', 'email', 'phone', 'notes'] as const;
export const SITE_COLUMNS = [
	'site_ref',
	'customer_ref',
	'address',
	'lat',
	'lon',
	'notes',
	'gate_code',
	'pets',
	'water_source',
	'no_gutters',
	'plants_to_protect',
	'pool',
	'power_line'
] as const;

export const SITE_FLAG_COLUMNS = {
	no_gutters: 'noGutters',
	plants_to_protect: 'plantsToProtect',
	pool: 'pool',
	power_line: 'powerLine'
} as const;

/** Most rows one file may hold; a larger list is imported in parts. */
export const MAX_IMPORT_ROWS = 5000;
/** Largest file, in characters. */
export const MAX_IMPORT_CHARS = 2_000_000;

// Cells are read as they are (no trimming), so export → import gives back exactly what was stored.
const text = (label: string, max: number) =>
	z.string().max(max, `${label} is too long (max ${max} characters).`).refine(noNul, NUL_MESSAGE);

const required = (label: string, min: number, max: number) =>
	text(label, max).refine((v) => v.trim().length >= min, `${label} is required.`);

/** An empty cell is "not given" (null), as the forms store it. */
const optional = (label: string, max: number) =>
	text(label, max).transform((v) => (v === '' ? null : v));

const ref = (label: string) =>
	required(label, 1, 100).refine((v) => v.trim() === v, `${label} has spaces at its ends.`);

const coord = (label: string, min: number, max: number) =>
	z
		.string()
		.refine((v) => v.trim() !== '', `${label} is required.`)
		.transform((v) => Number(v))
		.refine(Number.isFinite, `${label} must be a number.`)
		.refine((n) => n >= min && n <= max, `${label} must be between ${min} and ${max}.`);

/** yes / no / empty (not recorded), so a flag set to no reads back as no, not as missing. */
const flag = z
	.string()
	.transform((v) => v.trim().toLowerCase())
	.refine((v) => ['', 'yes', 'no'].includes(v), 'Write yes, no, or leave it empty.')
	.transform((v) => (v === '' ? undefined : v === 'yes'));

export const customerRowSchema = z.object({
	customer_ref: ref('customer_ref'),
	name: required('Name', 1, 120),
	email: optional('E-mail', 254).pipe(z.email('Enter a valid e-mail address.').nullable()),
	phone: optional('Phone', 40),
	notes: text('Notes', 2000)
});

export const siteRowSchema = z.object({
	site_ref: text('site_ref', 100),
	customer_ref: ref('customer_ref'),
	address: required('Address', 3, 200),
	lat: coord('Latitude', -90, 90),
	lon: coord('Longitude', -180, 180),
	notes: text('Notes', 2000),
	gate_code: optional('Gate code', 60),
	pets: optional('Pets', 200),
	water_source: optional('Water source', 200),
	no_gutters: flag,
	plants_to_protect: flag,
	pool: flag,
	power_line: flag
});

export type CustomerRow = z.infer<typeof customerRowSchema>;
export type SiteRow = z.infer<typeof siteRowSchema>;
