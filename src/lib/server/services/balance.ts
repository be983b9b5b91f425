import { and, asc, desc, eq, isNotNull, sql } from 'drizzle-orm';
import { formatCents, pctOf } from '../../estimating/money';
import type { EstimateResult } from '../../estimating/types';
import type { BalanceView, PaymentMethod } from '../../types/balance';
import { getDb, type Db } from '../db';
import {
	companies,
	customers,
	depositCheckouts,
	estimates,
	invoiceLinks,
	invoicePayments,
	invoices,
	jobs,
	proposalAnswers,
	proposals,
	sites
} from '../db/schema';
import { env } from '../env';
import { buildInvoiceEmail } from '../mail/invoice-email';
import { enqueueMail, sendQueuedMail, type DbTx } from '../mail/outbox';
import { createMailTransport } from '../mail/transport';
import { createCheckout, getPaymentsClient, type CheckoutRow } from '../payments';
import { hashProposalToken, newProposalToken, PROPOSAL_TOKEN } from '../proposals/token';
import { issueCreditNote, issueInvoice, type InvoiceLine } from './invoices';
import { auditStatus, recordAudit } from './audit';
import { Conflict, Forbidden, NotFound } from './errors';
import type { Caller } from './estimates';

/**
 * The end of a job's money: when the crew marks it done, the final invoice (the accepted price
 * and extras, less the deposit paid, with the rate card's tax) is issued, numbered in the
 * company's series, and e-mailed with a private pay link. The customer pays on the payment
 * service, whose webhook settles the invoice and moves the job to `paid`; or the owner records
 * cash or a cheque. An invoice is settled once; it never changes (a correction is a credit note).
 */

/** What the accepted proposal (if any) says the customer agreed to pay, and the deposit paid. */
async function acceptedTerms(tx: DbTx, companyId: string, estimateId: string) {
	const [answer] = await tx
		.select({ a: proposalAnswers, p: proposals })
		.from(proposalAnswers)
		.innerJoin(proposals, eq(proposals.id, proposalAnswers.proposalId))
		.where(
			and(
				eq(proposals.companyId, companyId),
				eq(proposals.estimateId, estimateId),
				eq(proposalAnswers.decision, 'accepted')
			)
		)
		.orderBy(desc(proposals.version))
		.limit(1);
	const paid = await tx
		.select({ cents: depositCheckouts.amountPaidCents })
		.from(depositCheckouts)
		.where(
			and(
				eq(depositCheckouts.companyId, companyId),
				eq(depositCheckouts.estimateId, estimateId),
				eq(depositCheckouts.kind, 'deposit'),
				isNotNull(depositCheckouts.paidAt)
			)
		);
	return {
		answer: answer ?? null,
		depositPaidCents: paid.reduce((n, r) => n + (r.cents ?? 0), 0)
	};
}

/**
 * The final invoice's lines, as plain arithmetic on what was accepted: the estimate's pre-tax
 * lines (discounts negative), each ticked extra, and the deposit already paid taken off; tax is
 * the estimate's tax plus the card's percentage of the extras, as the proposal priced them.
 */
export function finalInvoiceLines(
	result: Pick<EstimateResult, 'price'>,
	extras: { label: string; priceCents: number }[],
	taxPct: number,
	depositPaidCents: number
): { lines: InvoiceLine[]; taxCents: number } {
	const work = result.price.lineItems
		.filter((l) => l.code !== 'tax' && l.amountCents !== 0)
		.map((l) => ({ label: l.label.slice(0, 120), amountCents: l.amountCents }));
	const extraLines = extras.map((e) => ({
		label: `Extra: ${e.label}`.slice(0, 120),
		amountCents: e.priceCents
	}));
	const extrasCents = extras.reduce((n, e) => n + e.priceCents, 0);
	const lines = [...work, ...extraLines];
	if (depositPaidCents > 0)
		lines.push({ label: 'Less deposit paid', amountCents: -depositPaidCents });
	return { lines, taxCents: result.price.taxCents + pctOf(extrasCents, taxPct) };
}

/**
 * Inside markDone's transaction: issues the final invoice of a job's estimate and writes its
 * e-mail with the pay link to the outbox. Both commit with the job's move to done, or neither.
 * Returns the outbox message to try at once after the commit (null when there is no address).
 */
export async function issueFinalInvoice(
	tx: DbTx,
	caller: Caller,
	estimateId: string,
	linkBase: string
): Promise<{ invoiceId: string; mailId: string | null }> {
	const [row] = await tx
		.select({ e: estimates, site: sites, customer: customers, company: companies })
		.from(estimates)
		.innerJoin(sites, eq(sites.id, estimates.siteId))
		.innerJoin(customers, eq(customers.id, sites.customerId))
		.innerJoin(companies, eq(companies.id, estimates.companyId))
		.where(and(eq(estimates.id, estimateId), eq(estimates.companyId, caller.companyId)));
	if (!row) throw new NotFound('No such estimate.');
	const existing = await finalInvoiceOf(tx, caller.companyId, estimateId);
	if (existing) return { invoiceId: existing.id, mailId: null };
	const result = row.e.result as EstimateResult;
	const terms = await acceptedTerms(tx, caller.companyId, estimateId);
	const { lines, taxCents } = finalInvoiceLines(
		result,
		terms.answer?.a.extras ?? [],
		terms.answer?.p.taxPct ?? 0,
		terms.depositPaidCents
	);
	// A savepoint inside the caller's transaction: the number is taken and given back with it.
	const invoice = await issueInvoice(
		tx as unknown as Db,
		caller.companyId,
		estimateId,
		{ lines, taxCents },
		caller.id
	);
	const token = newProposalToken();
	// The address the customer accepted the proposal from, else the one on file.
	const to = terms.answer?.p.recipientEmail ?? row.customer.email ?? null;
	await tx.insert(invoiceLinks).values({
		companyId: caller.companyId,
		invoiceId: invoice.id,
		tokenHash: hashProposalToken(token),
		recipientEmail: to
	});
	if (!to) return { invoiceId: invoice.id, mailId: null };
	const built = buildInvoiceEmail({
		companyName: row.company.name,
		companyPhone: row.company.phone,
		customerName: row.customer.name,
		siteAddress: row.site.address,
		number: invoice.number,
		totalCents: invoice.totalCents,
		link: new URL(`/i/${token}`, linkBase).toString()
	});
	const queued = await enqueueMail(tx, {
		companyId: caller.companyId,
		idempotencyKey: `invoice:${invoice.id}`,
		from: env.mailFrom,
		to,
		...built,
		subjectKind: 'invoice',
		subjectId: invoice.id
	});
	return { invoiceId: invoice.id, mailId: queued.id };
}

/** One try at once; the outbox's retry loop takes over if it fails. */
export async function trySendNow(mailId: string | null): Promise<void> {
	if (!mailId) return;
	const db = await getDb();
	await sendQueuedMail(db, createMailTransport(), mailId).catch(() => null);
}

async function finalInvoiceOf(db: Db | DbTx, companyId: string, estimateId: string) {
	const [inv] = await db
		.select()
		.from(invoices)
		.where(
			and(
				eq(invoices.companyId, companyId),
				eq(invoices.estimateId, estimateId),
				eq(invoices.kind, 'invoice')
			)
		)
		.orderBy(asc(invoices.number))
		.limit(1);
	return inv ?? null;
}

async function viewOf(db: Db | DbTx, inv: typeof invoices.$inferSelect): Promise<BalanceView> {
	const [link] = await db
		.select({ to: invoiceLinks.recipientEmail })
		.from(invoiceLinks)
		.where(eq(invoiceLinks.invoiceId, inv.id));
	const [pay] = await db
		.select()
		.from(invoicePayments)
		.where(eq(invoicePayments.invoiceId, inv.id));
	const credits = await db
		.select({
			number: invoices.number,
			lines: invoices.lines,
			total: invoices.totalCents,
			issuedAt: invoices.issuedAt
		})
		.from(invoices)
		.where(and(eq(invoices.correctsId, inv.id), eq(invoices.kind, 'credit_note')))
		.orderBy(asc(invoices.number));
	return {
		invoiceId: inv.id,
		number: inv.number,
		issuedAt: inv.issuedAt.toISOString(),
		lines: inv.lines as BalanceView['lines'],
		subtotalCents: inv.subtotalCents,
		taxCents: inv.taxCents,
		totalCents: inv.totalCents,
		creditedCents: credits.reduce((n, c) => n + c.total, 0),
		credits: credits.map((c) => ({
			number: c.number,
			reason: (c.lines as BalanceView['lines'])[0]?.label ?? '',
			amountCents: -c.total,
			issuedAt: c.issuedAt.toISOString()
		})),
		recipientEmail: link?.to ?? null,
		paid: pay
			? {
					method: pay.method,
					amountCents: pay.amountCents,
					reference: pay.reference,
					paidAt: pay.paidAt.toISOString()
				}
			: null
	};
}

/** The office's view of an estimate's final invoice; null before the job is done. */
export async function balanceOf(
	companyId: string,
	estimateId: string
): Promise<BalanceView | null> {
	const db = await getDb();
	const inv = await finalInvoiceOf(db, companyId, estimateId);
	return inv ? viewOf(db, inv) : null;
}

/** What is owed on an invoice: its total less its credit notes (stored negative). */
const owed = (v: BalanceView) => Math.max(0, v.totalCents + v.creditedCents);

/**
 * Settles an invoice once, in `tx`: records the payment, and moves the job and its estimate
 * from done to paid. A second settlement changes nothing and answers false.
 */
async function settle(
	tx: DbTx,
	inv: typeof invoices.$inferSelect,
	p: {
		method: PaymentMethod;
		amountCents: number;
		reference: string;
		paidAt: Date;
		by: string | null;
	}
): Promise<boolean> {
	const [made] = await tx
		.insert(invoicePayments)
		.values({
			companyId: inv.companyId,
			invoiceId: inv.id,
			method: p.method,
			amountCents: p.amountCents,
			reference: p.reference,
			paidAt: p.paidAt,
			recordedBy: p.by
		})
		.onConflictDoNothing({ target: invoicePayments.invoiceId })
		.returning({ id: invoicePayments.id });
	if (!made) return false;
	const moved = await tx
		.update(estimates)
		.set({ status: 'paid' })
		.where(
			and(
				eq(estimates.id, inv.estimateId),
				eq(estimates.companyId, inv.companyId),
				eq(estimates.status, 'done')
			)
		)
		.returning({ id: estimates.id });
	const how = p.method === 'card' ? 'paid by card' : `${p.method} recorded`;
	const actor = p.by ? { userId: p.by } : { userId: null, name: 'Payment service' as const };
	await recordAudit(tx, inv.companyId, actor, {
		kind: 'invoice',
		action: 'payment',
		subjectId: inv.id,
		summary: `Invoice ${inv.number}: ${formatCents(p.amountCents)} ${how}`,
		detail: { method: p.method, amountCents: p.amountCents, reference: p.reference }
	});
	if (moved.length) {
		await auditStatus(tx, inv.companyId, actor, inv.estimateId, 'done', 'paid', how);
	}
	await tx
		.update(jobs)
		.set({ status: 'paid' })
		.where(
			and(
				eq(jobs.estimateId, inv.estimateId),
				eq(jobs.companyId, inv.companyId),
				eq(jobs.status, 'done')
			)
		);
	return true;
}

/** Inside the webhook's transaction: a paid balance checkout settles its invoice by card. */
export async function onBalanceChange(tx: DbTx, checkout: CheckoutRow): Promise<void> {
	if (checkout.status !== 'complete' || checkout.paidAt === null || !checkout.invoiceId) return;
	const [inv] = await tx
		.select()
		.from(invoices)
		.where(and(eq(invoices.id, checkout.invoiceId), eq(invoices.companyId, checkout.companyId)));
	if (!inv) return;
	await settle(tx, inv, {
		method: 'card',
		amountCents: checkout.amountPaidCents ?? checkout.amountCents,
		reference: checkout.id,
		paidAt: checkout.paidAt,
		by: null
	});
}

/**
 * The estimate's final invoice, locked for the rest of `tx`: the row lock queues a card
 * payment's webhook, the owner's payment record and a credit note, so none of them cross.
 */
async function lockedFinalInvoice(tx: DbTx, companyId: string, estimateId: string) {
	const inv = await finalInvoiceOf(tx, companyId, estimateId);
	if (!inv) {
		throw new Conflict('There is no final invoice yet: it is issued when the job is marked done.');
	}
	await tx.execute(sql`select id from invoices where id = ${inv.id} for update`);
	return { inv, view: await viewOf(tx, inv) };
}

/**
 * The owner records cash or a cheque for an estimate's final invoice. The amount is what is
 * owed, from the invoice itself; the form only says how and gives a reference.
 */
export async function recordPayment(
	caller: Caller,
	estimateId: string,
	input: { method: 'cash' | 'cheque'; reference: string },
	now = new Date()
): Promise<BalanceView> {
	if (caller.role !== 'owner') throw new Forbidden('Only the owner records a payment.');
	const db = await getDb();
	return db.transaction(async (tx) => {
		const { inv, view } = await lockedFinalInvoice(tx, caller.companyId, estimateId);
		if (view.paid)
			throw new Conflict(`Invoice ${inv.number} is already paid; nothing was changed.`);
		await settle(tx, inv, {
			method: input.method,
			amountCents: owed(view),
			reference: input.reference,
			paidAt: now,
			by: caller.id
		});
		return viewOf(tx, inv);
	});
}

/**
 * The owner's correction of a final invoice that was sent: a credit note for `amountCents` off
 * what is owed, with the reason as its line. The invoice itself never changes. The tax part is
 * the invoice's own share of tax, so a credit of the whole balance takes its tax with it.
 */
export async function creditBalance(
	caller: Caller,
	estimateId: string,
	input: { reason: string; amountCents: number }
): Promise<BalanceView> {
	if (caller.role !== 'owner') throw new Forbidden('Only the owner issues a credit note.');
	const db = await getDb();
	return db.transaction(async (tx) => {
		const { inv, view } = await lockedFinalInvoice(tx, caller.companyId, estimateId);
		if (view.paid) {
			throw new Conflict(
				`Invoice ${inv.number} is already paid; a credit note can only correct what is still owed.`
			);
		}
		const due = owed(view);
		if (input.amountCents > due) {
			throw new Conflict(
				`A credit of ${formatCents(input.amountCents)} is more than the ${formatCents(due)} still owed on invoice ${inv.number}.`
			);
		}
		const taxCents =
			inv.totalCents > 0 ? Math.round((input.amountCents * inv.taxCents) / inv.totalCents) : 0;
		// A savepoint inside this transaction, like the final invoice itself.
		await issueCreditNote(
			tx as unknown as Db,
			caller.companyId,
			inv.id,
			{ lines: [{ label: input.reason, amountCents: input.amountCents - taxCents }], taxCents },
			caller.id
		);
		return viewOf(tx, inv);
	});
}

// ——— The customer's pay page: reached by the private link only ———

async function invoiceByToken(token: string) {
	if (!PROPOSAL_TOKEN.test(token)) return null;
	const db = await getDb();
	const [r] = await db
		.select({ inv: invoices, site: sites, customer: customers, company: companies })
		.from(invoiceLinks)
		.innerJoin(invoices, eq(invoices.id, invoiceLinks.invoiceId))
		.innerJoin(estimates, eq(estimates.id, invoices.estimateId))
		.innerJoin(sites, eq(sites.id, estimates.siteId))
		.innerJoin(customers, eq(customers.id, sites.customerId))
		.innerJoin(companies, eq(companies.id, invoices.companyId))
		.where(eq(invoiceLinks.tokenHash, hashProposalToken(token)));
	return r ?? null;
}

export type CustomerInvoice = {
	balance: BalanceView;
	owedCents: number;
	company: { name: string; phone: string | null; email: string | null; address: string | null };
	customerName: string;
	siteAddress: string;
};

export async function customerInvoice(token: string): Promise<CustomerInvoice> {
	const r = await invoiceByToken(token);
	if (!r)
		throw new NotFound('This invoice link is not valid. Check that the whole link was copied.');
	const db = await getDb();
	const balance = await viewOf(db, r.inv);
	return {
		balance,
		owedCents: owed(balance),
		company: {
			name: r.company.name,
			phone: r.company.phone,
			email: r.company.email,
			address: r.company.postalAddress
		},
		customerName: r.customer.name,
		siteAddress: r.site.address
	};
}

/**
 * Starts (or returns the open) card checkout for an invoice's balance. The amount is what the
 * invoice says is owed, never a figure from the browser; the key counts earlier checkouts, so a
 * double click makes one session and a cancelled payment can be started again.
 */
export async function startBalancePayment(token: string, origin: string): Promise<string> {
	const r = await invoiceByToken(token);
	if (!r)
		throw new NotFound('This invoice link is not valid. Check that the whole link was copied.');
	const db = await getDb();
	const view = await viewOf(db, r.inv);
	if (view.paid) throw new Conflict('This invoice is already paid. Thank you!');
	const amount = owed(view);
	if (amount < 50) throw new Conflict('Nothing is left to pay by card on this invoice.');
	const earlier = await db
		.select()
		.from(depositCheckouts)
		.where(eq(depositCheckouts.invoiceId, r.inv.id))
		.orderBy(desc(depositCheckouts.createdAt));
	const open = earlier.find((c) => c.status === 'open' && c.url && c.amountCents === amount);
	if (open) return open.url!;
	const link = new URL(`/i/${token}`, origin).toString();
	const made = await createCheckout(db, getPaymentsClient(), {
		kind: 'balance',
		invoiceId: r.inv.id,
		companyId: r.inv.companyId,
		estimateId: r.inv.estimateId,
		amountCents: amount,
		description: `Invoice ${r.inv.number} — ${r.site.address} roof cleaning`,
		customerEmail: view.recipientEmail ?? undefined,
		successUrl: `${link}?payment=paid`,
		cancelUrl: `${link}?payment=cancelled`,
		idempotencyKey: `balance:${r.inv.id}:${earlier.length + 1}`
	});
	return made.url;
}
