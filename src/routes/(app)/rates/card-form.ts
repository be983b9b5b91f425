import type { z } from 'zod';
import type { RateCard } from '$lib/estimating/rate-card';
import { ACCESS_GRADES, GROWTH_GRADES, MATERIALS } from '$lib/estimating/types';
import { rateCardSchema } from '$lib/schemas/rate-card';
import { ACCESS_LABELS, GROWTH_LABELS, MATERIAL_LABELS } from '$lib/components/estimate/format';

/**
 * The Rates form: one text input per figure of the rate card, named by its path in the card
 * (materials.slate.perSquareCents). Whole-cent amounts are typed in dollars. The browser uses
 * the same conversion for the live preview; the server's parse is the one that counts.
 */

/** `dollars`: stored in cents, typed in dollars. */
export type FieldKind = 'dollars' | 'number';

export interface Field {
	path: string;
	label: string;
	unit: string;
	kind: FieldKind;
}

export interface TableSection {
	id: string;
	title: string;
	hint: string;
	rowHeader: string;
	columns: { key: string; label: string; unit: string; kind: FieldKind }[];
	rows: { key: string; label: string }[];
}

export interface ListSection {
	id: string;
	title: string;
	hint: string;
	fields: Field[];
}

const col = (key: string, label: string, unit: string, kind: FieldKind = 'number') => ({
	key,
	label,
	unit,
	kind
});

export const TABLES: TableSection[] = [
	{
		id: 'materials',
		title: 'Materials',
		hint: 'Price per square (100 ft² of roof surface), mix strength range, coverage and production at ground access.',
		rowHeader: 'Material',
		columns: [
			col('perSquareCents', 'Per square', '$', 'dollars'),
			col('minStrengthPct', 'Min. strength', '%'),
			col('baseStrengthPct', 'Base strength', '%'),
			col('maxStrengthPct', 'Max. strength', '%'),
			col('coverageGalPerSquare', 'Mix per square per coat', 'gal'),
			col('productionSquaresPerHour', 'Production', 'squares/h')
		],
		rows: MATERIALS.map((m) => ({ key: m, label: MATERIAL_LABELS[m] }))
	},
	{
		id: 'growth',
		title: 'Growth grades',
		hint: 'Strength step on the base strength, coats, and multipliers on price and labour.',
		rowHeader: 'Grade',
		columns: [
			col('strengthStepPct', 'Strength step', 'points'),
			col('applications', 'Applications', 'coats'),
			col('priceMultiplier', 'Price', '×'),
			col('labourFactor', 'Labour', '×')
		],
		rows: GROWTH_GRADES.map((g) => ({ key: g, label: GROWTH_LABELS[g] }))
	},
	{
		id: 'access',
		title: 'Access grades',
		hint: 'Multipliers for how the crew reaches the facet.',
		rowHeader: 'Access',
		columns: [col('priceMultiplier', 'Price', '×'), col('labourMultiplier', 'Labour', '×')],
		rows: ACCESS_GRADES.map((a) => ({ key: a, label: ACCESS_LABELS[a] }))
	},
	{
		id: 'stories',
		title: 'Stories',
		hint: 'Multipliers by the number of stories under the eave.',
		rowHeader: 'Stories',
		columns: [col('priceMultiplier', 'Price', '×'), col('labourMultiplier', 'Labour', '×')],
		rows: [
			{ key: '1', label: '1 storey' },
			{ key: '2', label: '2 stories' },
			{ key: '3', label: '3 stories' }
		]
	}
];

const f = (path: string, label: string, unit: string, kind: FieldKind = 'number'): Field => ({
	path,
	label,
	unit,
	kind
});

export const LISTS: ListSection[] = [
	{
		id: 'job',
		title: 'Job charges',
		hint: 'Added once per job.',
		fields: [
			f('minimumJobCents', 'Minimum job charge', '$', 'dollars'),
			f('tripChargeCents', 'Trip charge', '$', 'dollars'),
			f('postRinseCentsPerFt2', 'Post-rinse', '¢/ft²'),
			f('lift.chargeCents', 'Lift charge', '$', 'dollars'),
			f('depositPct', 'Deposit', '%'),
			f('maxDiscountPct', 'Largest discount allowed', '%'),
			f('taxPct', 'Tax', '%')
		]
	},
	{
		id: 'steep',
		title: 'Steep pitch and ladders',
		hint: 'Steep facets add anchors and harness set-up; ladder facets add set-ups along the eave.',
		fields: [
			f('steepPitch.thresholdRise', 'Steep above', 'in per 12'),
			f('steepPitch.priceMultiplier', 'Steep price', '×'),
			f('steepPitch.setupHours', 'Steep set-up', 'h'),
			f('ladder.setupMinutes', 'Ladder set-up', 'min'),
			f('ladder.eaveFtPerPlacement', 'Eave per ladder placement', 'ft')
		]
	},
	{
		id: 'range',
		title: 'Price range',
		hint: 'The low/high range shown while the plan is remote-only, and once a site visit confirms it.',
		fields: [
			f('range.remote.lowPct', 'Remote: below', '%'),
			f('range.remote.highPct', 'Remote: above', '%'),
			f('range.confirmed.lowPct', 'Confirmed: below', '%'),
			f('range.confirmed.highPct', 'Confirmed: above', '%')
		]
	},
	{
		id: 'labour',
		title: 'Labour and overhead',
		hint: 'Wages, crew and fixed time per job; overhead is a share of the price.',
		fields: [
			f('labour.centsPerTechnicianHour', 'Wage per technician hour', '$', 'dollars'),
			f('labour.crewSize', 'Crew size', 'people'),
			f('labour.setupHours', 'Set-up, pre-wet, teardown', 'h'),
			f('labour.rinseMinutesPerSquare', 'Rinse', 'min/square'),
			f('overheadPct', 'Overhead', '% of price')
		]
	},
	{
		id: 'chemistry',
		title: 'Chemistry',
		hint: 'Stock on hand (trade %), costs, surfactant dose, waste and water.',
		fields: [
			f('chemistry.stockStrengthPct', 'Stock strength', '%'),
			f('chemistry.stockCentsPerGal', 'Stock cost', '$/gal', 'dollars'),
			f('chemistry.surfactantOzPerGal', 'Surfactant dose', 'fl oz/gal'),
			f('chemistry.surfactantCentsPerOz', 'Surfactant cost', '$/fl oz', 'dollars'),
			f('chemistry.wastePct', 'Waste allowance', '%'),
			f('chemistry.preWetGalPerEaveFt', 'Pre-wet water', 'gal/ft of eave'),
			f('chemistry.rinseGalPerEaveFt', 'Rinse water', 'gal/ft of eave'),
			f('chemistry.noGuttersPreWetMultiplier', 'Pre-wet with no gutters', '×'),
			f('chemistry.dwellMinutes', 'Dwell limit per coat', 'min')
		]
	},
	{
		id: 'test-spot',
		title: 'Test spot',
		hint: 'How the colour change of a test spot moves the suggested strength.',
		fields: [
			f('testSpot.quickSeconds', 'Quick at or under', 's'),
			f('testSpot.slowSeconds', 'Slow over', 's'),
			f('testSpot.adjustStepPct', 'Strength step', 'points')
		]
	}
];

/** Every field of the form, tables first. */
export const FIELDS: Field[] = [
	...TABLES.flatMap((t) =>
		t.rows.flatMap((r) =>
			t.columns.map((c) => ({
				path: `${t.id}.${r.key}.${c.key}`,
				label: `${r.label}: ${c.label}`,
				unit: c.unit,
				kind: c.kind
			}))
		)
	),
	...LISTS.flatMap((l) => l.fields)
];

const BY_PATH = new Map(FIELDS.map((x) => [x.path, x]));

export type FormValues = Record<string, string>;
export type FormErrors = Record<string, string>;

function getPath(obj: unknown, path: string): unknown {
	return path.split('.').reduce<unknown>((o, k) => (o as Record<string, unknown>)?.[k], obj);
}

function setPath(obj: Record<string, unknown>, path: string, value: number) {
	const keys = path.split('.');
	let o = obj;
	for (const k of keys.slice(0, -1)) o = (o[k] ??= {}) as Record<string, unknown>;
	o[keys[keys.length - 1]] = value;
}

/** Trims float noise (0.1 + 0.2) so the form shows what the owner typed. */
const clean = (x: number) => String(Math.round(x * 1e6) / 1e6);

export function cardToForm(card: RateCard): FormValues {
	const out: FormValues = {};
	for (const field of FIELDS) {
		const v = getPath(card, field.path) as number;
		out[field.path] = field.kind === 'dollars' ? (v / 100).toFixed(2) : clean(v);
	}
	return out;
}

const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)$/;

/** Identifiers inside the schema's messages, in the words of the form. */
const WORDS: Record<string, string> = {
	minStrengthPct: 'min. strength',
	maxStrengthPct: 'max. strength',
	baseStrengthPct: 'base strength',
	quickSeconds: '“quick”',
	slowSeconds: '“slow”'
};

function humanise(issue: z.core.$ZodIssue, field: Field): string {
	if (field.kind === 'dollars') {
		if (issue.code === 'too_small')
			return `Must be at least $${(Number(issue.minimum) / 100).toFixed(2)}`;
		if (issue.code === 'too_big')
			return `Must be at most $${(Number(issue.maximum) / 100).toFixed(2)}`;
		if (issue.code === 'invalid_type' || issue.code === 'invalid_format') {
			return 'Use dollars and whole cents, e.g. 32.50';
		}
	}
	let msg = issue.message.replace(/^[A-Za-z0-9.]+ (?=must|is )/, '');
	for (const [id, words] of Object.entries(WORDS)) msg = msg.replaceAll(id, words);
	msg = msg.replace(/ cents$/, ' ¢');
	return msg.charAt(0).toUpperCase() + msg.slice(1);
}

export type ParsedForm = { ok: true; card: RateCard } | { ok: false; errors: FormErrors };

/** Form values to a checked card, or one message per bad field (keyed by path). */
export function formToCard(values: FormValues): ParsedForm {
	const errors: FormErrors = {};
	const raw: Record<string, unknown> = {};
	for (const field of FIELDS) {
		const text = (values[field.path] ?? '').trim().replace(/^\$/, '').replaceAll(',', '');
		if (text === '') {
			errors[field.path] = 'Required';
			continue;
		}
		if (!NUMBER.test(text)) {
			errors[field.path] =
				field.kind === 'dollars' ? 'Enter an amount, e.g. 32.50' : 'Enter a number';
			continue;
		}
		const n = Number(text);
		if (field.kind === 'dollars') {
			const cents = Math.round(n * 100 * 1e6) / 1e6;
			if (!Number.isInteger(cents)) {
				errors[field.path] = 'Use whole cents (at most 2 decimals)';
				continue;
			}
			setPath(raw, field.path, cents);
		} else {
			setPath(raw, field.path, n);
		}
	}
	if (Object.keys(errors).length > 0) return { ok: false, errors };
	const parsed = rateCardSchema.safeParse(raw);
	if (parsed.success) return { ok: true, card: parsed.data };
	for (const issue of parsed.error.issues) {
		const path = issue.path.map(String).join('.');
		const field = BY_PATH.get(path);
		const key = field ? path : '_';
		errors[key] ??= field ? humanise(issue, field) : issue.message;
	}
	return { ok: false, errors };
}

export interface CardChange {
	label: string;
	from: string;
	to: string;
}

function show(field: Field, v: number): string {
	if (field.kind === 'dollars') return `$${(v / 100).toFixed(2)}`;
	const unit = field.unit === '×' ? '×' : ` ${field.unit}`;
	return field.unit === '×' ? `×${clean(v)}` : `${clean(v)}${unit}`;
}

/** Figures that differ between two cards, in form order. */
export function diffCards(before: RateCard, after: RateCard): CardChange[] {
	const out: CardChange[] = [];
	for (const field of FIELDS) {
		const a = getPath(before, field.path) as number;
		const b = getPath(after, field.path) as number;
		if (a !== b) out.push({ label: field.label, from: show(field, a), to: show(field, b) });
	}
	return out;
}
