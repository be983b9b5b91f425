// Invoice numbers: one series per company with no gap and no duplicate, even when many invoices
// are issued at once, and an issued invoice never changes (a correction is a credit note). Run on
// the embedded database and on a real PostgreSQL server (Debian's postgresql), where concurrent
// transactions really do overlap. Gap-free numbering by a counter row updated in the invoice's
// own transaction is the usual PostgreSQL pattern (common practice; a sequence would leave gaps
// on rollback, as the PostgreSQL manual says of nextval: "sequence operations are never rolled
// back", §9.17 Sequence Manipulation Functions).
import path from 'node:path';
import { eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '$lib/server/db';
import { startPostgres, type TempPostgres } from '../helpers/postgres';

let pgServer: TempPostgres;

beforeAll(async () => {
	pgServer = await startPostgres();
}, 120_000);
afterAll(() => pgServer?.stop());

type Setup = { db: Db; companyId: string; otherCompanyId: string; estimateIds: string[] };

async function open(kind: 'pglite' | 'postgres'): Promise<Setup> {
	const { closeDb, getDb } = await import('$lib/server/db');
	await closeDb();
	if (kind === 'postgres') {
		process.env.DATABASE_URL = pgServer.url;
	} else {
		process.env.DATABASE_URL = '';
		process.env.CLEARPITCH_DATA_DIR = path.resolve(
			'tmp/data',
			`invoices-${process.pid}-${Date.now()}`
		);
	}
	const db = await getDb();
	const s = await import('$lib/server/db/schema');
	const { DEFAULT_RATE_CARD } = await import('$lib/estimating/rate-card');
	const [c, o] = await db
		.insert(s.companies)
		.values([{ name: 'Harbor & Pine Exterior Care' }, { name: 'Marrowgate Roof Care' }])
		.returning();
	const [card] = await db
		.insert(s.rateCards)
		.values({ companyId: c.id, version: 1, card: DEFAULT_RATE_CARD })
		.returning();
	const est = await db
		.insert(s.estimates)
		.values(
			[1, 2, 3, 4].map(() => ({
				companyId: c.id,
				rateCardId: card.id,
				rateCardVersion: 1,
				input: {},
				result: {},
				totalCents: 120_000
			}))
		)
		.returning();
	return { db, companyId: c.id, otherCompanyId: o.id, estimateIds: est.map((e) => e.id) };
}

const line = (cents: number) => ({ label: 'Roof soft wash, balance', amountCents: cents });

for (const kind of ['pglite', 'postgres'] as const) {
	describe(`invoice numbers on ${kind === 'pglite' ? 'the embedded database' : 'PostgreSQL'}`, () => {
		let t: Setup;
		let inv: typeof import('$lib/server/services/invoices');
		beforeAll(async () => {
			t = await open(kind);
			inv = await import('$lib/server/services/invoices');
		}, 120_000);
		afterAll(async () => {
			const { closeDb } = await import('$lib/server/db');
			await closeDb();
		});

		it('numbers 40 invoices issued at once 1…40, no gap, no duplicate', async () => {
			const issued = await Promise.all(
				Array.from({ length: 40 }, (_, i) =>
					inv.issueInvoice(t.db, t.companyId, t.estimateIds[i % 3], {
						lines: [line(10_000 + i)],
						taxCents: 0
					})
				)
			);
			const numbers = issued.map((x) => x.number).sort((a, b) => a - b);
			expect(numbers).toEqual(Array.from({ length: 40 }, (_, i) => i + 1));
		});

		it('gives a number back when the issuing transaction rolls back', async () => {
			const s = await import('$lib/server/db/schema');
			const [{ last }] = await t.db
				.select({ last: sql<number>`max(${s.invoices.number})` })
				.from(s.invoices)
				.where(eq(s.invoices.companyId, t.companyId));
			// A refused invoice (bad line) takes no number.
			await expect(
				inv.issueInvoice(t.db, t.companyId, t.estimateIds[0], {
					lines: [{ label: '', amountCents: 1.5 }],
					taxCents: 0
				})
			).rejects.toThrow(/invoice has 2 problems: lines\.0\.label, lines\.0\.amountCents/);
			// Another company's estimate is not found, inside the transaction: nothing kept.
			await expect(
				inv.issueInvoice(t.db, t.otherCompanyId, t.estimateIds[0], {
					lines: [line(500)],
					taxCents: 0
				})
			).rejects.toThrow(/No such estimate/);
			const next = await inv.issueInvoice(t.db, t.companyId, t.estimateIds[0], {
				lines: [line(500)],
				taxCents: 40
			});
			expect(next.number).toBe(Number(last) + 1);
			expect(next.totalCents).toBe(540);
			// The other company's series is its own and has not started.
			const theirs = await t.db
				.select()
				.from(s.invoiceCounters)
				.where(eq(s.invoiceCounters.companyId, t.otherCompanyId));
			expect(theirs).toEqual([]);
		});

		it('refuses to change or remove an issued invoice, at the database', async () => {
			const [one] = await inv.invoicesOf(t.db, t.companyId, t.estimateIds[1]);
			await expect(
				t.db.execute(
					sql`update invoices set total_cents = 1, subtotal_cents = 1 where id = ${one.id}`
				)
			).rejects.toThrow();
			await expect(t.db.execute(sql`delete from invoices where id = ${one.id}`)).rejects.toThrow();
			const [again] = await inv.invoicesOf(t.db, t.companyId, t.estimateIds[1]);
			expect(again).toEqual(one);
		});

		it('corrects with a credit note that takes the next number and cannot over-credit', async () => {
			// The fourth estimate has no invoice yet.
			const first = await inv.issueInvoice(t.db, t.companyId, t.estimateIds[3], {
				lines: [line(30_000), { label: 'Gutter brightening', amountCents: 9_500 }],
				taxCents: 2_765
			});
			expect(first.totalCents).toBe(42_265);
			const credit = await inv.issueCreditNote(t.db, t.companyId, first.id, {
				lines: [{ label: 'Gutter brightening not done', amountCents: 9_500 }],
				taxCents: 665
			});
			expect(credit.number).toBe(first.number + 1);
			expect(credit.kind).toBe('credit_note');
			expect(credit.totalCents).toBe(-10_165);
			expect(credit.correctsId).toBe(first.id);
			await expect(
				inv.issueCreditNote(t.db, t.companyId, first.id, {
					lines: [{ label: 'Too much', amountCents: 40_000 }],
					taxCents: 0
				})
			).rejects.toThrow(/more than the 32100 cents left on invoice/);
			await expect(
				inv.issueCreditNote(t.db, t.companyId, credit.id, { lines: [line(1)], taxCents: 0 })
			).rejects.toThrow(/corrects an invoice, not a credit note/);
			const all = await inv.invoicesOf(t.db, t.companyId, t.estimateIds[3]);
			expect(all.reduce((s, x) => s + x.totalCents, 0)).toBe(42_265 - 10_165);
		});
	});
}
