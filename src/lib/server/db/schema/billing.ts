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
import { PAYMENT_METHODS } from '../../../types/balance';
import { id, timestamps } from './columns';
import { companies } from './company';
import { users } from './auth';
import { invoices } from './invoices';

export const paymentMethodEnum = pgEnum('payment_method', PAYMENT_METHODS);

/**
 * The customer's private link to an invoice (its pay page). Only the token's SHA-256 is kept,
 * as for proposals. The invoice itself never changes, so the link lives beside it.
 */
export const invoiceLinks = pgTable(
	'invoice_links',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		invoiceId: uuid('invoice_id')
			.notNull()
			.references(() => invoices.id),
		tokenHash: text('token_hash').notNull(),
		recipientEmail: text('recipient_email'),
		...timestamps
	},
	(t) => [
		unique('invoice_links_invoice_uq').on(t.invoiceId),
		unique('invoice_links_token_uq').on(t.tokenHash)
	]
);

/**
 * What settled an invoice: a card payment through the payment service (its checkout named), or
 * cash or a cheque the owner recorded. One per invoice: a second settlement is refused.
 */
export const invoicePayments = pgTable(
	'invoice_payments',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		invoiceId: uuid('invoice_id')
			.notNull()
			.references(() => invoices.id),
		method: paymentMethodEnum('method').notNull(),
		amountCents: integer('amount_cents').notNull(),
		/** A cheque number or receipt note; the checkout session id for a card payment. */
		reference: text('reference').notNull().default(''),
		paidAt: timestamp('paid_at', { withTimezone: true, mode: 'date' }).notNull(),
		recordedBy: uuid('recorded_by').references(() => users.id),
		...timestamps
	},
	(t) => [
		unique('invoice_payments_invoice_uq').on(t.invoiceId),
		index('invoice_payments_company_idx').on(t.companyId, t.paidAt)
	]
);
