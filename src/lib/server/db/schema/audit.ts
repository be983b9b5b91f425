import { index, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { id } from './columns';
import { companies } from './company';
import { users } from './auth';

/**
 * Who changed what and when. Rows are only ever added, in the same transaction as the change
 * they describe; the app has no path that edits or removes one, and a trigger
 * (`audit_log_never_changes`) refuses it at the database too. There is no `updated_at`: a row
 * is never updated.
 */
export const auditLog = pgTable(
	'audit_log',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		at: timestamp('at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
		/** The signed-in member who made the change; null for the customer or a service. */
		actorId: uuid('actor_id').references(() => users.id),
		/** The name at the time, so the row reads the same after a rename. */
		actorName: text('actor_name').notNull(),
		kind: text('kind').notNull(),
		action: text('action').notNull(),
		subjectId: uuid('subject_id'),
		summary: text('summary').notNull(),
		/** Before and after of what changed, in plain values (never a hash or a secret). */
		detail: jsonb('detail').notNull().default({})
	},
	(t) => [
		index('audit_log_company_at').on(t.companyId, t.at),
		index('audit_log_company_kind_at').on(t.companyId, t.kind, t.at),
		index('audit_log_company_actor_at').on(t.companyId, t.actorId, t.at)
	]
);
