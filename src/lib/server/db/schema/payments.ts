import {
	bigint,
	index,
	integer,
	pgEnum,
	pgTable,
	text,
	timestamp,
	uuid
} from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { companies } from './company';
import { estimates } from './estimating';
import { invoices } from './invoices';

export const CHECKOUT_STATUSES = ['open', 'complete', 'expired'] as const;
export type CheckoutStatus = (typeof CHECKOUT_STATUSES)[number];
export const checkoutStatusEnum = pgEnum('checkout_status', CHECKOUT_STATUSES);

/** What a checkout pays: an accepted proposal's deposit, or a final invoice's balance. */
export const CHECKOUT_KINDS = ['deposit', 'balance'] as const;
export type CheckoutKind = (typeof CHECKOUT_KINDS)[number];
export const checkoutKindEnum = pgEnum('checkout_kind', CHECKOUT_KINDS);

/**
 * A checkout at the payment service (a deposit, or a final invoice's balance), mirrored from its
 * answers and its events.
 */
export const depositCheckouts = pgTable(
	'deposit_checkouts',
	{
		/** The service's checkout session id (cs_…). */
		id: text('id').primaryKey(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		estimateId: uuid('estimate_id')
			.notNull()
			.references(() => estimates.id),
		kind: checkoutKindEnum('kind').notNull().default('deposit'),
		/** For a balance: the invoice it pays. */
		invoiceId: uuid('invoice_id').references(() => invoices.id),
		/** What the app asked to charge, in cents; decided on the server, never by the browser. */
		amountCents: integer('amount_cents').notNull(),
		currency: text('currency').notNull(),
		idempotencyKey: text('idempotency_key').notNull(),
		status: checkoutStatusEnum('status').notNull().default('open'),
		/** What the service reports as paid, in cents, once complete. */
		amountPaidCents: integer('amount_paid_cents'),
		paidAt: timestamp('paid_at', { withTimezone: true, mode: 'date' }),
		url: text('url'),
		...timestamps
	},
	(t) => [index('deposit_checkouts_estimate_idx').on(t.estimateId)]
);

/** Webhook events already applied: a replayed or duplicated delivery changes nothing twice. */
export const paymentEvents = pgTable('payment_events', {
	/** The service's event id (evt_…). */
	id: text('id').primaryKey(),
	/** Null when the event names no checkout of ours. */
	companyId: uuid('company_id').references(() => companies.id),
	type: text('type').notNull(),
	/** The checkout session the event is about, when it is about one. */
	objectId: text('object_id'),
	/** The event's own time at the service (seconds since 1970), for ordering questions. */
	serviceCreated: bigint('service_created', { mode: 'number' }).notNull(),
	/** What applying it did: "applied", "ignored" (older than what we know) or "unrelated". */
	outcome: text('outcome').notNull(),
	...timestamps
});
