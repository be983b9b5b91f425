import {
	date,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	text,
	timestamp,
	unique,
	uuid
} from 'drizzle-orm/pg-core';
import { JOB_STATUSES, type JobHistoryEntry } from '../../../types/job';
import { id, timestamps } from './columns';
import { companies } from './company';
import { users } from './auth';
import { estimates } from './estimating';

export const jobStatusEnum = pgEnum('job_status', JOB_STATUSES);

/**
 * A scheduled visit to do an accepted estimate's work: one per estimate. The current plan sits
 * in the columns; `history` gains an entry for every change and never loses one, so a
 * postponement keeps the date it moved from and why. `revision` counts plan changes; the
 * customer's e-mail for each change is keyed by it.
 */
export const jobs = pgTable(
	'jobs',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		estimateId: uuid('estimate_id')
			.notNull()
			.references(() => estimates.id),
		status: jobStatusEnum('status').notNull().default('scheduled'),
		/** Local calendar date of the visit; null while postponed without a new date. */
		date: date('date', { mode: 'string' }),
		/** Arrival window, 24-hour HH:MM local time. */
		windowStart: text('window_start').notNull(),
		windowEnd: text('window_end').notNull(),
		/** The estimate's crew hours on site, from the model's labour figure. */
		expectedHours: doublePrecision('expected_hours').notNull(),
		crewIds: uuid('crew_ids').array().notNull(),
		revision: integer('revision').notNull().default(1),
		history: jsonb('history').$type<JobHistoryEntry[]>().notNull().default([]),
		scheduledBy: uuid('scheduled_by').references(() => users.id),
		doneAt: timestamp('done_at', { withTimezone: true, mode: 'date' }),
		...timestamps
	},
	(t) => [
		unique('jobs_estimate').on(t.estimateId),
		index('jobs_company_date_idx').on(t.companyId, t.date)
	]
);

/** What the crew logged on the day: one row per job, the latest state the device sent. */
export const jobLogs = pgTable('job_logs', {
	id: id(),
	companyId: uuid('company_id')
		.notNull()
		.references(() => companies.id),
	jobId: uuid('job_id')
		.notNull()
		.unique()
		.references(() => jobs.id),
	checklist: jsonb('checklist').$type<Record<string, boolean>>().notNull().default({}),
	/** Chemical actually used: gallons of stock and fluid ounces of surfactant. */
	stockGalUsed: doublePrecision('stock_gal_used'),
	surfactantOzUsed: doublePrecision('surfactant_oz_used'),
	/** The stock strength the crew measured on the day (trade %). */
	measuredStockPct: doublePrecision('measured_stock_pct'),
	notes: text('notes').notNull().default(''),
	/** Why the job was closed without the full checklist or an after photo. */
	doneReason: text('done_reason'),
	/** When the device made the change: an older write arriving late never replaces a newer one. */
	clientUpdatedAt: timestamp('client_updated_at', { withTimezone: true, mode: 'date' }),
	updatedBy: uuid('updated_by').references(() => users.id),
	...timestamps
});
