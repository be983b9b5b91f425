import {
	boolean,
	date,
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	real,
	text,
	timestamp,
	unique,
	uuid
} from 'drizzle-orm/pg-core';
import { PROPOSAL_STATUSES } from '../../../proposal/status';
import type { ProposalSnapshot, TickedExtra } from '../../../proposal/types';
import { id, timestamps } from './columns';
import { companies } from './company';
import { users } from './auth';
import { estimates } from './estimating';

export const proposalStatusEnum = pgEnum('proposal_status', PROPOSAL_STATUSES);

/**
 * What was sent to the customer, frozen: one row per version of an estimate's proposal. A later
 * change to the estimate makes a new version; a row's snapshot and prices never change.
 */
export const proposals = pgTable(
	'proposals',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		estimateId: uuid('estimate_id')
			.notNull()
			.references(() => estimates.id),
		version: integer('version').notNull(),
		status: proposalStatusEnum('status').notNull().default('open'),
		/** SHA-256 (hex) of the customer's link token; the token itself is never stored. */
		tokenHash: text('token_hash').notNull(),
		/** SHA-256 of the estimate's frozen input and result: which estimate revision this is. */
		estimateDigest: text('estimate_digest').notNull(),
		/** Scope, notes, company and customer as the customer reads them. */
		snapshot: jsonb('snapshot').$type<ProposalSnapshot>().notNull(),
		totalCents: integer('total_cents').notNull(),
		depositCents: integer('deposit_cents').notNull(),
		/** From the estimate's rate card, to price ticked extras the same way. */
		depositPct: real('deposit_pct').notNull(),
		taxPct: real('tax_pct').notNull(),
		/** Good until the end of this day. */
		validUntil: date('valid_until', { mode: 'string' }).notNull(),
		recipientEmail: text('recipient_email').notNull(),
		sentBy: uuid('sent_by').references(() => users.id),
		revokedAt: timestamp('revoked_at', { withTimezone: true, mode: 'date' }),
		...timestamps
	},
	(t) => [
		unique('proposals_estimate_version_uq').on(t.estimateId, t.version),
		unique('proposals_token_hash_uq').on(t.tokenHash),
		index('proposals_company_estimate_idx').on(t.companyId, t.estimateId)
	]
);

export const ANSWER_DECISIONS = ['accepted', 'declined'] as const;
export const answerDecisionEnum = pgEnum('proposal_decision', ANSWER_DECISIONS);

/** The customer's answer to one proposal: exactly one per proposal, never edited. */
export const proposalAnswers = pgTable('proposal_answers', {
	id: id(),
	companyId: uuid('company_id')
		.notNull()
		.references(() => companies.id),
	proposalId: uuid('proposal_id')
		.notNull()
		.unique('proposal_answers_proposal_uq')
		.references(() => proposals.id),
	decision: answerDecisionEnum('decision').notNull(),
	/** The typed signature (accepted only). */
	fullName: text('full_name'),
	consent: boolean('consent').notNull().default(false),
	extras: jsonb('extras').$type<TickedExtra[]>().notNull().default([]),
	declineReason: text('decline_reason'),
	answeredAt: timestamp('answered_at', { withTimezone: true, mode: 'date' }).notNull(),
	/** The client address the answer came from, as the server saw it. */
	ipAddress: text('ip_address'),
	userAgent: text('user_agent'),
	/** Exactly what was answered: the proposal version, the estimate revision and the price. */
	proposalVersion: integer('proposal_version').notNull(),
	estimateDigest: text('estimate_digest').notNull(),
	totalCents: integer('total_cents').notNull(),
	depositCents: integer('deposit_cents').notNull(),
	...timestamps
});
