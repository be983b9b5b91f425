import { and, asc, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import type { Db } from '../db';
import { estimates, invoices, type InvoiceKind } from '../db/schema';
import { Conflict, Invalid, NotFound, type Issue } from './errors';
import { recordAudit, type AuditActor } from './audit';
import { formatCents } from '../../estimating/money';

/** A transaction or the database: issuing always runs inside one of the caller's choosing. */
type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

const lineSchema = z.object({
	label: z
		.string({ error: 'label is required' })
		.trim()
		.min(1, { error: 'label is required' })
		.max(120, { error: 'label must be at most 120 characters' }),
	amountCents: z
		.number({ error: 'amountCents must be a whole number of cents' })
		.int({ error: 'amountCents must be a whole number of cents' })
		.min(-100_000_000, { error: 'amountCents is out of range' })
		.max(100_000_000, { error: 'amountCents is out of range' })
});

const issueSchema = z.object({
	lines: z.array(lineSchema).min(1, { error: 'an invoice needs at least one line' }).max(50),
	taxCents: z
		.number({ error: 'taxCents must be a whole number of cents' })
		.int({ error: 'taxCents must be a whole number of cents' })
		.min(0, { error: 'taxCents must be zero or more' })
});

export type InvoiceLine = z.infer<typeof lineSchema>;

export type IssuedInvoice = {
	id: string;
	number: number;
	kind: InvoiceKind;
	estimateId: string;
	correctsId: string | null;
	lines: InvoiceLine[];
	subtotalCents: number;
	taxCents: number;
	totalCents: number;
	issuedAt: Date;
};

function checked(input: unknown): z.infer<typeof issueSchema> {
	const parsed = issueSchema.safeParse(input);
	if (parsed.success) return parsed.data;
	const issues: Issue[] = parsed.error.issues.map((i) => ({
		path: i.path.join('.'),
		message: i.message
	}));
	throw Invalid.of(issues, 'invoice');
}

/**
 * The company's next number, taken inside `tx`. The counter row's lock makes concurrent issuers
 * wait their turn; a rollback returns the number with the rest of the transaction.
 */
async function takeNumber(tx: Tx, companyId: string): Promise<number> {
	const r = await tx.execute<{ number: number }>(sql`
		insert into invoice_counters (company_id, next) values (${companyId}, 2)
		on conflict (company_id) do update set next = invoice_counters.next + 1
		returning next - 1 as number`);
	const rows = 'rows' in r ? r.rows : (r as unknown as { number: number }[]);
	return Number(rows[0].number);
}

async function insertInvoice(
	tx: Tx,
	v: {
		companyId: string;
		kind: InvoiceKind;
		estimateId: string;
		correctsId: string | null;
		lines: InvoiceLine[];
		taxCents: number;
		createdBy: string | null;
	}
): Promise<IssuedInvoice> {
	const subtotalCents = v.lines.reduce((s, l) => s + l.amountCents, 0);
	const number = await takeNumber(tx, v.companyId);
	const [row] = await tx
		.insert(invoices)
		.values({ ...v, number, subtotalCents, totalCents: subtotalCents + v.taxCents })
		.returning();
	return shape(row);
}

function shape(row: typeof invoices.$inferSelect): IssuedInvoice {
	return {
		id: row.id,
		number: row.number,
		kind: row.kind,
		estimateId: row.estimateId,
		correctsId: row.correctsId,
		lines: row.lines as InvoiceLine[],
		subtotalCents: row.subtotalCents,
		taxCents: row.taxCents,
		totalCents: row.totalCents,
		issuedAt: row.issuedAt
	};
}

/** Issues an invoice for one of the company's estimates, numbered next in the company's series. */
export async function issueInvoice(
	db: Db,
	companyId: string,
	estimateId: string,
	input: { lines: InvoiceLine[]; taxCents: number },
	createdBy: string | null = null
): Promise<IssuedInvoice> {
	const body = checked(input);
	if (body.lines.reduce((s, l) => s + l.amountCents, 0) < 0)
		throw Invalid.of([{ path: 'lines', message: 'an invoice cannot total less than zero' }]);
	return db.transaction(async (tx) => {
		const [est] = await tx
			.select({ id: estimates.id })
			.from(estimates)
			.where(and(eq(estimates.id, estimateId), eq(estimates.companyId, companyId)));
		if (!est) throw new NotFound('No such estimate.');
		const issued = await insertInvoice(tx, {
			companyId,
			kind: 'invoice',
			estimateId,
			correctsId: null,
			lines: body.lines,
			taxCents: body.taxCents,
			createdBy
		});
		await recordAudit(tx, companyId, invoiceActor(createdBy), {
			kind: 'invoice',
			action: 'issued',
			subjectId: issued.id,
			summary: `Issued invoice ${issued.number} for ${formatCents(issued.totalCents)}`,
			detail: { number: issued.number, estimateId, totalCents: issued.totalCents }
		});
		return issued;
	});
}

/**
 * A credit note against an issued invoice: the correction of an invoice that never changes.
 * Its lines are the amounts credited (positive); it is stored with negative amounts so a sum
 * over an estimate's invoices and credit notes is what the customer owes. It can't credit more
 * than the invoice less what earlier credit notes took off it.
 */
export async function issueCreditNote(
	db: Db,
	companyId: string,
	invoiceId: string,
	input: { lines: InvoiceLine[]; taxCents: number },
	createdBy: string | null = null
): Promise<IssuedInvoice> {
	const body = checked(input);
	return db.transaction(async (tx) => {
		const [inv] = await tx
			.select()
			.from(invoices)
			.where(and(eq(invoices.id, invoiceId), eq(invoices.companyId, companyId)));
		if (!inv) throw new NotFound('No such invoice.');
		if (inv.kind !== 'invoice')
			throw new Conflict('A credit note corrects an invoice, not a credit note.');
		const earlier = await tx
			.select({ total: invoices.totalCents })
			.from(invoices)
			.where(and(eq(invoices.correctsId, inv.id), eq(invoices.companyId, companyId)));
		const left = inv.totalCents + earlier.reduce((s, r) => s + r.total, 0);
		const credit = body.lines.reduce((s, l) => s + l.amountCents, 0) + body.taxCents;
		if (credit <= 0)
			throw Invalid.of([{ path: 'lines', message: 'a credit note must credit more than zero' }]);
		if (credit > left)
			throw new Conflict(
				`This credit of ${credit} cents is more than the ${left} cents left on invoice ${inv.number}.`
			);
		const issued = await insertInvoice(tx, {
			companyId,
			kind: 'credit_note',
			estimateId: inv.estimateId,
			correctsId: inv.id,
			lines: body.lines.map((l) => ({ label: l.label, amountCents: -l.amountCents })),
			taxCents: -body.taxCents,
			createdBy
		});
		await recordAudit(tx, companyId, invoiceActor(createdBy), {
			kind: 'invoice',
			action: 'credit-note',
			subjectId: issued.id,
			summary: `Issued credit note ${issued.number} for ${formatCents(credit)} against invoice ${inv.number}`,
			detail: {
				number: issued.number,
				invoiceNumber: inv.number,
				estimateId: inv.estimateId,
				creditedCents: credit
			}
		});
		return issued;
	});
}

/** Issued by a member, or by Clearpitch itself (the balance invoice sent when a job is done). */
const invoiceActor = (createdBy: string | null): AuditActor =>
	createdBy ? { userId: createdBy } : { userId: null, name: 'Clearpitch' };

/** The company's invoices and credit notes for one estimate, in number order. */
export async function invoicesOf(db: Db, companyId: string, estimateId: string) {
	const rows = await db
		.select()
		.from(invoices)
		.where(and(eq(invoices.companyId, companyId), eq(invoices.estimateId, estimateId)))
		.orderBy(asc(invoices.number));
	return rows.map(shape);
}
