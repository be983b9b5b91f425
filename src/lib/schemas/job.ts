import { z } from 'zod';
import { noNul, NUL_MESSAGE } from './form';
import { isHm, isIsoDate, minutesOf } from '../jobs/week';
import { MIN_REASON_LENGTH } from '../jobs/checklist';

const uuid = (what: string) => z.uuid(`${what} is not a valid id.`);

const isoDate = z
	.string({ error: 'Pick a date.' })
	.trim()
	.refine(isIsoDate, 'Pick a date (YYYY-MM-DD).');

const hm = (label: string) =>
	z
		.string({ error: `Enter the ${label} time.` })
		.trim()
		.refine(isHm, `Enter the ${label} time as HH:MM (24-hour).`);

/** Crew ids arrive as repeated form fields; one to six technicians on a job. */
const crewIds = z
	.array(uuid('A crew member'), { error: 'Pick the crew.' })
	.min(1, 'Pick at least one crew member.')
	.max(6, 'Pick at most six crew members.')
	.transform((ids) => [...new Set(ids)]);

const windowEndsAfterStart = {
	// Zod runs an object's refinements even when a field failed: judge only two real times.
	check: (v: { windowStart: unknown; windowEnd: unknown }) =>
		typeof v.windowStart !== 'string' ||
		typeof v.windowEnd !== 'string' ||
		!isHm(v.windowStart) ||
		!isHm(v.windowEnd) ||
		minutesOf(v.windowEnd) > minutesOf(v.windowStart),
	params: { path: ['windowEnd'], message: 'The window must end after it starts.' }
};

export const scheduleSchema = z
	.object({
		estimateId: uuid('The estimate'),
		date: isoDate,
		windowStart: hm('start'),
		windowEnd: hm('end'),
		crewIds
	})
	.refine(windowEndsAfterStart.check, windowEndsAfterStart.params);

export const moveSchema = z
	.object({
		jobId: uuid('The job'),
		/** The revision the form was drawn from: a job changed since is refused, not overwritten. */
		revision: z.coerce.number().int().min(1, 'Reload the schedule and try again.'),
		date: isoDate,
		windowStart: hm('start'),
		windowEnd: hm('end'),
		crewIds
	})
	.refine(windowEndsAfterStart.check, windowEndsAfterStart.params);

const reason = z
	.string({ error: 'Give a reason.' })
	.trim()
	.min(MIN_REASON_LENGTH, `Give a reason of at least ${MIN_REASON_LENGTH} characters.`)
	.max(500, 'Keep the reason under 500 characters.')
	.refine(noNul, NUL_MESSAGE);

export const postponeSchema = z.object({
	jobId: uuid('The job'),
	revision: z.coerce.number().int().min(1, 'Reload the schedule and try again.'),
	reason,
	/** Empty: postponed with no new date yet. */
	newDate: z
		.string()
		.trim()
		.optional()
		.transform((v) => (v ? v : null))
		.refine((v) => v === null || isIsoDate(v), 'Pick a date (YYYY-MM-DD), or leave it empty.')
});

export const doneSchema = z.object({
	reason: z
		.string()
		.trim()
		.max(1000, 'Keep the reason under 1000 characters.')
		.refine(noNul, NUL_MESSAGE)
		.optional()
		.transform((v) => (v ? v : null))
});

const amount = (label: string, max: number) =>
	z
		.number({ error: `${label} must be a number.` })
		.refine(Number.isFinite, `${label} must be a number.`)
		.min(0, `${label} can't be negative.`)
		.max(max, `${label} must be at most ${max}.`)
		.nullable();

/** The crew's log as the device sends it (JSON). */
export const jobLogSchema = z.strictObject({
	checklist: z
		.record(
			z.string().min(1).max(80).refine(noNul, NUL_MESSAGE),
			z.boolean({ error: 'A tick is true or false.' })
		)
		.refine((r) => Object.keys(r).length <= 200, 'Too many checklist entries.'),
	stockGalUsed: amount('Stock used (gal)', 1000),
	surfactantOzUsed: amount('Surfactant used (fl oz)', 10_000),
	measuredStockPct: z
		.number({ error: 'Measured strength must be a number.' })
		.refine(Number.isFinite, 'Measured strength must be a number.')
		.gt(0, 'Measured strength must be above 0%.')
		.max(20, 'Measured strength must be at most 20%.')
		.nullable(),
	notes: z.string().max(4000, 'Keep notes under 4000 characters.').refine(noNul, NUL_MESSAGE),
	clientUpdatedAt: z.iso.datetime({ error: 'clientUpdatedAt must be an ISO date-time.' })
});

export type JobLogBody = z.infer<typeof jobLogSchema>;
