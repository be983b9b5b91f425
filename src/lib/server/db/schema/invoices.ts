import {
	type AnyPgColumn,
	check,
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	primaryKey,
	timestamp,
	unique,
	uuid
} from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import { id, timestamps } from './columns';
import { companies } from './company';
import { users } from './auth';
import { estimates } from './estimating';

/**
 * The next invoice number of each company. Taking a number updates this one row inside the
 * invoice's own transaction: concurrent issuers queue on the row lock, and a transaction that
 * rolls back gives its number back, so numbers have no gap and no duplicate.
 */
export const invoiceCounters = pgTable(
	'invoice_counters',
	{
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		next: integer('next').notNull().default(1)
	},
	(t) => [primaryKey({ columns: [t.companyId] })]
);

export const INVOICE_KINDS = ['invoice', 'credit_note'] as const;
export type InvoiceKind = (typeof INVOICE_KINDS)[number];
export const invoiceKindEnum = pgEnum('invoice_kind', INVOICE_KINDS);

/**
 * An invoice or credit note as issued: never changed afterwards (a correction is a credit note
 * that names the invoice it corrects). Invoices and credit notes share one number sequence.
 */
export const invoices = pgTable(
	'invoices',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		number: integer('number').notNull(),
		kind: invoiceKindEnum('kind').notNull(),
		estimateId: uuid('estimate_id')
			.notNull()
			.references(() => estimates.id),
		/** For a credit note: the invoice it corrects. */
		correctsId: uuid('corrects_id').references((): AnyPgColumn => invoices.id),
		/** The lines as issued: [{ label, amountCents }], frozen. */
		lines: jsonb('lines').notNull(),
		subtotalCents: integer('subtotal_cents').notNull(),
		taxCents: integer('tax_cents').notNull(),
		totalCents: integer('total_cents').notNull(),
		issuedAt: timestamp('issued_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
		createdBy: uuid('created_by').references(() => users.id),
		...timestamps
	},
	(t) => [
		unique('invoices_company_number_uq').on(t.companyId, t.number),
		index('invoices_estimate_idx').on(t.estimateId),
		check('invoices_total_adds_up', sql`${t.totalCents} = ${t.subtotalCents} + ${t.taxCents}`)
	]
);
