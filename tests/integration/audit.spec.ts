// The audit log through the services, in process on a fresh PGlite seeded with the demo: every
// change the log is for writes its row in the change's own transaction (a refused change writes
// none), with who made it and the values before and after; and the database refuses to edit it.
import path from 'node:path';
import { asc, eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '$lib/server/db';
import { linkIn } from '../helpers/proposal';

const dir = path.resolve('tmp/data', `audit-${process.pid}-${Date.now()}`);
let db: Db;
let schema: typeof import('$lib/server/db/schema');
let companyId: string;
type Member = { id: string; companyId: string; role: 'owner' | 'sales'; name: string };
let owner: Member;
let sales: Member;
const IN_30 = new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10);

beforeAll(async () => {
	process.env.CLEARPITCH_DATA_DIR = dir;
	process.env.DATABASE_URL = '';
	// Mail waits in the outbox (no SMTP set): the proposal's link is read from there.
	delete process.env.CLEARPITCH_SMTP_URL;
	const { getDb } = await import('$lib/server/db');
	const { seedDemo } = await import('$lib/server/seed/demo');
	schema = await import('$lib/server/db/schema');
	({ companyId } = await seedDemo({ samples: true }));
	db = await getDb();
	const member = async (role: 'owner' | 'sales') => {
		const [u] = await db.select().from(schema.users).where(eq(schema.users.role, role));
		return { id: u.id, companyId, role, name: u.name };
	};
	owner = await member('owner');
	sales = await member('sales');
});
afterAll(async () => {
	const { closeDb } = await import('$lib/server/db');
	await closeDb();
});

type Row = typeof import('$lib/server/db/schema').auditLog.$inferSelect;
const allRows = () => db.select().from(schema.auditLog).orderBy(asc(schema.auditLog.at));

/** Runs `change` and answers the audit rows it added (a refused change must add none). */
async function rowsOf(change: () => Promise<unknown>): Promise<Row[]> {
	const before = new Set((await allRows()).map((r) => r.id));
	await change();
	return (await allRows()).filter((r) => !before.has(r.id));
}

async function refusedWithNoRow(change: () => Promise<unknown>) {
	const before = (await allRows()).length;
	await expect(change()).rejects.toThrow();
	expect((await allRows()).length).toBe(before);
}

/** A new draft estimate of a seeded site, priced from its saved plan as the API prices. */
async function newDraft(): Promise<{ id: string; totalCents: number }> {
	const { priceEstimateBody } = await import('$lib/server/services/estimates');
	const [e] = await db.select().from(schema.estimates).limit(1);
	const body = { siteId: e.siteId, roofPlanId: e.roofPlanId, save: true };
	const done = await priceEstimateBody(owner, new TextEncoder().encode(JSON.stringify(body)));
	if (!done.saved) throw new Error('not saved');
	return { id: done.priced.estimate!.id, totalCents: done.priced.price.totalCents };
}

describe('rates and prices', () => {
	it('a saved rate card names its version and every figure that moved, from what to what', async () => {
		const { latestRateCard, saveRateCard } = await import('$lib/server/services/rate-cards');
		const current = await latestRateCard(companyId);
		const card = structuredClone(current.card);
		card.materials.slate.perSquareCents += 500;
		const rows = await rowsOf(() => saveRateCard(companyId, owner.id, card, 'Slate up $5'));
		expect(rows).toHaveLength(1);
		expect(rows[0]).toMatchObject({
			companyId,
			actorId: owner.id,
			actorName: owner.name,
			kind: 'rate-card',
			action: 'saved'
		});
		expect(rows[0].summary).toBe(
			`Saved rates version ${current.version + 1} (1 figure changed): Slate up $5`
		);
		expect(rows[0].detail).toMatchObject({
			version: current.version + 1,
			changes: [
				{
					path: 'materials.slate.perSquareCents',
					from: current.card.materials.slate.perSquareCents,
					to: current.card.materials.slate.perSquareCents + 500
				}
			]
		});
	});

	it('a priced estimate records its price; a status move records from and to', async () => {
		const { changeStatus } = await import('$lib/server/services/estimates');
		let made = { id: '', totalCents: 0 };
		const priced = await rowsOf(async () => (made = await newDraft()));
		expect(priced).toHaveLength(1);
		expect(priced[0]).toMatchObject({
			kind: 'estimate',
			action: 'priced',
			subjectId: made.id,
			actorId: owner.id,
			detail: { totalCents: made.totalCents }
		});
		const moved = await rowsOf(() => changeStatus(owner, made.id, 'ready'));
		expect(moved).toHaveLength(1);
		expect(moved[0]).toMatchObject({
			kind: 'estimate',
			action: 'status',
			subjectId: made.id,
			actorName: owner.name,
			detail: { from: 'draft', to: 'ready' }
		});
		// A move the status path does not allow is refused and leaves no row.
		await refusedWithNoRow(() => changeStatus(owner, made.id, 'paid'));
	});

	it('the moves made by scheduling and finishing a job are recorded (the demo seed makes them)', async () => {
		const rows = await allRows();
		const moves = rows
			.filter((r) => r.action === 'status')
			.map((r) => `${(r.detail as { from: string }).from}→${(r.detail as { to: string }).to}`);
		expect(moves).toEqual(expect.arrayContaining(['accepted→scheduled', 'scheduled→done']));
		// One priced row per seeded estimate, at least: every sample was priced through the service.
		const seeded = await db.select({ id: schema.estimates.id }).from(schema.estimates);
		for (const e of seeded) {
			expect(
				rows.some((r) => r.action === 'priced' && r.subjectId === e.id),
				e.id
			).toBe(true);
		}
	});

	it('sending a proposal, the customer declining and a paid deposit each record their move', async () => {
		const proposals = await import('$lib/server/services/proposals');
		const { changeStatus } = await import('$lib/server/services/estimates');
		const declined = await newDraft();
		await changeStatus(owner, declined.id, 'ready');
		let proposalId = '';
		const sent = await rowsOf(async () => {
			proposalId = (
				await proposals.sendProposal(
					sales,
					declined.id,
					{ to: 'marisol.quenby@wrenfield.example', validUntil: IN_30 },
					'http://localhost:3999'
				)
			).proposalId;
		});
		expect(sent.map((r) => [r.action, r.actorId, r.detail])).toEqual([
			['status', sales.id, { from: 'ready', to: 'sent' }]
		]);
		const [m] = await db
			.select()
			.from(schema.mailOutbox)
			.where(eq(schema.mailOutbox.subjectId, proposalId));
		const link = linkIn(m.textBody);
		const token = link.slice(link.lastIndexOf('/') + 1);
		const answered = await rowsOf(() =>
			proposals.answerProposal(
				token,
				{ decision: 'declined', reason: 'Too soon' },
				{ ipAddress: '203.0.113.7', userAgent: 'vitest' }
			)
		);
		expect(answered).toHaveLength(1);
		expect(answered[0]).toMatchObject({
			actorId: null,
			actorName: 'The customer, on the proposal link',
			detail: { from: 'sent', to: 'declined' }
		});

		// A deposit paid on another sent estimate: the webhook's transaction moves it.
		const paid = await newDraft();
		await changeStatus(owner, paid.id, 'ready');
		await proposals.sendProposal(
			sales,
			paid.id,
			{ to: 'marisol.quenby@wrenfield.example', validUntil: IN_30 },
			'http://localhost:3999'
		);
		const checkout = {
			status: 'complete',
			paidAt: new Date(),
			estimateId: paid.id,
			companyId
		} as Parameters<typeof proposals.onDepositChange>[1];
		const deposit = await rowsOf(() =>
			db.transaction((tx) => proposals.onDepositChange(tx, checkout))
		);
		expect(deposit).toHaveLength(1);
		expect(deposit[0]).toMatchObject({
			actorId: null,
			actorName: 'The payment service',
			subjectId: paid.id,
			detail: { from: 'sent', to: 'accepted' }
		});
		// The same event again changes nothing, so it records nothing.
		expect(
			await rowsOf(() => db.transaction((tx) => proposals.onDepositChange(tx, checkout)))
		).toEqual([]);
	});
});

describe('team and tokens', () => {
	it('invite, role, deactivate, reactivate, token and revoke each write one row by the owner', async () => {
		const team = await import('$lib/server/services/team');
		let newId = '';
		const invited = await rowsOf(async () => {
			newId = await team.inviteUser(
				companyId,
				{
					name: 'Tamsin Orrow',
					email: 'tamsin.orrow@harborpine.example',
					role: 'crew',
					password: 'long-enough-passphrase-2026'
				},
				owner.id
			);
		});
		const role = await rowsOf(() => team.setRole(companyId, newId, 'estimator', owner.id));
		const off = await rowsOf(() => team.setActive(companyId, newId, false, owner.id));
		const on = await rowsOf(() => team.setActive(companyId, newId, true, owner.id));
		const made = await rowsOf(() => team.createToken(companyId, owner.id, 'Quote form'));
		const [tok] = await db
			.select()
			.from(schema.apiTokens)
			.where(eq(schema.apiTokens.name, 'Quote form'));
		const revoked = await rowsOf(() => team.revokeToken(companyId, tok.id, owner.id));
		const all = [invited, role, off, on, made, revoked];
		for (const rows of all) {
			expect(rows).toHaveLength(1);
			expect(rows[0]).toMatchObject({ actorId: owner.id, actorName: owner.name });
		}
		expect(all.map((r) => `${r[0].kind}.${r[0].action}`)).toEqual([
			'team.invited',
			'team.role',
			'team.deactivated',
			'team.reactivated',
			'token.created',
			'token.revoked'
		]);
		expect(invited[0].detail).toMatchObject({
			role: 'crew',
			email: 'tamsin.orrow@harborpine.example'
		});
		expect(role[0].detail).toMatchObject({ from: 'crew', to: 'estimator' });
		expect(role[0].summary).toBe("Changed Tamsin Orrow's role from crew to estimator");
		// Nothing to record: the same role again, a revoked token revoked again.
		expect(await rowsOf(() => team.setRole(companyId, newId, 'estimator', owner.id))).toEqual([]);
		expect(await rowsOf(() => team.revokeToken(companyId, tok.id, owner.id))).toEqual([]);
		// Refused: the last active owner cannot be deactivated, and no row says otherwise.
		await refusedWithNoRow(() => team.setActive(companyId, owner.id, false, owner.id));
		// Never a password or a hash in a row.
		expect(JSON.stringify(invited[0])).not.toMatch(/long-enough|argon2/);
	});
});

describe('invoices, credit notes and company settings', () => {
	it('an invoice and a credit note against it each write a row with their numbers and amounts', async () => {
		const inv = await import('$lib/server/services/invoices');
		const [e] = await db.select().from(schema.estimates).limit(1);
		let invoice: Awaited<ReturnType<typeof inv.issueInvoice>> | undefined;
		const issued = await rowsOf(async () => {
			invoice = await inv.issueInvoice(
				db,
				companyId,
				e.id,
				{ lines: [{ label: 'Roof soft wash, balance', amountCents: 48_000 }], taxCents: 0 },
				owner.id
			);
		});
		expect(issued).toHaveLength(1);
		expect(issued[0]).toMatchObject({
			kind: 'invoice',
			action: 'issued',
			subjectId: invoice!.id,
			detail: { number: invoice!.number, totalCents: 48_000 }
		});
		const credited = await rowsOf(() =>
			inv.issueCreditNote(
				db,
				companyId,
				invoice!.id,
				{ lines: [{ label: 'Refund: gutter rinse not done', amountCents: 6_500 }], taxCents: 0 },
				owner.id
			)
		);
		expect(credited).toHaveLength(1);
		expect(credited[0]).toMatchObject({
			kind: 'invoice',
			action: 'credit-note',
			actorId: owner.id,
			detail: { invoiceNumber: invoice!.number, creditedCents: 6_500 }
		});
		// More than is left on the invoice: refused, and no row.
		await refusedWithNoRow(() =>
			inv.issueCreditNote(
				db,
				companyId,
				invoice!.id,
				{ lines: [{ label: 'Too much', amountCents: 48_000 }], taxCents: 0 },
				owner.id
			)
		);
	});

	it('company settings record the fields that changed, before and after', async () => {
		const company = await import('$lib/server/services/company');
		const before = await company.getCompany(companyId);
		const contact = {
			phone: '555-0142',
			email: before!.email,
			postalAddress: before!.postalAddress,
			licence: before!.licence
		};
		const rows = await rowsOf(() => company.setContact(companyId, contact, owner.id));
		expect(rows).toHaveLength(1);
		expect(rows[0]).toMatchObject({
			kind: 'company',
			action: 'contact',
			summary: 'Changed the company details: phone',
			detail: { from: { phone: before!.phone }, to: { phone: '555-0142' } }
		});
		// Saving the same values again changes nothing and records nothing.
		expect(await rowsOf(() => company.setContact(companyId, contact, owner.id))).toEqual([]);
		const imagery = await rowsOf(() =>
			company.setImagery(
				companyId,
				'https://tiles.wrenfield.example/{z}/{x}/{y}.jpg',
				'Wrenfield survey',
				owner.id
			)
		);
		expect(imagery[0]).toMatchObject({ kind: 'company', action: 'imagery' });
		expect(imagery[0].detail).toMatchObject({
			to: {
				imageryUrlTemplate: 'https://tiles.wrenfield.example/{z}/{x}/{y}.jpg',
				imageryAttribution: 'Wrenfield survey'
			}
		});
	});
});

describe('the log itself', () => {
	it('refuses UPDATE, DELETE and TRUNCATE at the database, and keeps its rows', async () => {
		const before = (await allRows()).length;
		expect(before).toBeGreaterThan(0);
		for (const statement of [
			sql`update audit_log set summary = 'edited'`,
			sql`delete from audit_log`,
			sql`truncate audit_log`
		]) {
			await expect(db.execute(statement)).rejects.toThrow();
		}
		const after = await allRows();
		expect(after.length).toBe(before);
		expect(after.some((r) => r.summary === 'edited')).toBe(false);
	});
});
