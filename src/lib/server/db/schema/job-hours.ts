import { doublePrecision, pgTable, uuid } from 'drizzle-orm/pg-core';
import { id, timestamps } from './columns';
import { companies } from './company';
import { users } from './auth';
import { jobs } from './jobs';

/**
 * The crew hours a job actually took, as the owner records them from the crew's time sheet: one
 * row per job, set again when corrected. The reports set them beside the model's expected hours.
 */
export const jobHours = pgTable('job_hours', {
	id: id(),
	companyId: uuid('company_id')
		.notNull()
		.references(() => companies.id),
	jobId: uuid('job_id')
		.notNull()
		.unique('job_hours_job_uq')
		.references(() => jobs.id),
	hours: doublePrecision('hours').notNull(),
	recordedBy: uuid('recorded_by').references(() => users.id),
	...timestamps
});
