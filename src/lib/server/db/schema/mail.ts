import {
	index,
	integer,
	pgEnum,
	pgTable,
	text,
	timestamp,
	unique,
	uuid
} from 'drizzle-orm/pg-core';
import { id, timestamps } from './columns';
import { companies } from './company';

export const MAIL_STATUSES = ['queued', 'sending', 'sent', 'failed', 'dead'] as const;
export type MailStatus = (typeof MAIL_STATUSES)[number];
export const mailStatusEnum = pgEnum('mail_status', MAIL_STATUSES);

/**
 * Every message is written here before it is sent, so a refused or dropped send is retried and
 * shown, never lost. One row per idempotency key: asking twice sends one message.
 */
export const mailOutbox = pgTable(
	'mail_outbox',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		/** e.g. "proposal:<id>:v<version>"; the same key never makes a second message. */
		idempotencyKey: text('idempotency_key').notNull(),
		/** What the message is about, for showing its state there (e.g. kind "proposal"). */
		subjectKind: text('subject_kind'),
		subjectId: uuid('subject_id'),
		fromAddress: text('from_address').notNull(),
		toAddress: text('to_address').notNull(),
		subject: text('subject').notNull(),
		textBody: text('text_body').notNull(),
		htmlBody: text('html_body').notNull(),
		status: mailStatusEnum('status').notNull().default('queued'),
		attempts: integer('attempts').notNull().default(0),
		lastError: text('last_error'),
		/** When the retry loop may next pick it up (also the lease end while "sending"). */
		nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true, mode: 'date' })
			.notNull()
			.defaultNow(),
		sentAt: timestamp('sent_at', { withTimezone: true, mode: 'date' }),
		/** The Message-ID header, fixed before the first try so a repeat send carries the same. */
		messageId: text('message_id').notNull(),
		...timestamps
	},
	(t) => [
		unique('mail_outbox_key_uq').on(t.companyId, t.idempotencyKey),
		index('mail_outbox_due_idx').on(t.status, t.nextAttemptAt),
		index('mail_outbox_subject_idx').on(t.subjectKind, t.subjectId)
	]
);
