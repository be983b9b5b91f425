// Proposals through the service, in process on a fresh PGlite with the local SMTP fake: one
// proposal however often it is sent, a new version when the estimate changed (what was accepted
// stays as accepted), hashed private links that expire and can be withdrawn, exactly one answer
// even when two arrive at once, extras priced on the server, and a refused e-mail retried.
import path from 'node:path';
import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Db } from '$lib/server/db';
import type { SmtpFake } from '$lib/server/fakes/smtp';
import { pctOf } from '$lib/estimating/money';
import { linkIn } from '../helpers/proposal';

const dir = path.resolve('tmp/data', `proposals-${process.pid}-${Date.now()}`);
let db: Db;
let smtp: SmtpFake;
let svc: typeof import('$lib/server/services/proposals');
let errors: typeof import('$lib/server/services/errors');
let schema: typeof import('$lib/server/db/schema');
let mail: typeof import('$lib/server/mail');
let companyId: string;
let sales: { id: string; companyId: string; role: 'sales'; name: string };
const BASE = 'http://localhost:3999';
const TOMORROW = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
const IN_30 = new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10);
const meta = { ipAddress: '203.0.113.7', userAgent: 'vitest' };

beforeAll(async () => {
	const { startSmtpFake } = await import('$lib/server/fakes/smtp');
	smtp = await startSmtpFake();
	process.env.CLEARPITCH_DATA_DIR = dir;
	process.env.DATABASE_URL = '';
	process.env.CLEARPITCH_SMTP_URL = smtp.url;
	const { getDb } = await import('$lib/server/db');
	const { seedDemo } = await import('$lib/server/seed/demo');
	schema = await import('$lib/server/db/schema');
	svc = await import('$lib/server/services/proposals');
	errors = await import('$lib/server/services/errors');
	mail = await import('$lib/server/mail');
	({ companyId } = await seedDemo({ samples: true }));
	db = await getDb();
	const [u] = await db.select().from(schema.users).where(eq(schema.users.role, 'sales'));
	sales = { id: u.id, companyId, role: 'sales', name: u.name };
});

afterAll(async () => {
	await smtp?.close();
	const { closeDb } = await import('$lib/server/db');
	await closeDb();
});

beforeEach(() => {
	smtp.refuse(null);
	smtp.clear();
});

/** A fresh ready estimate: a copy of a seeded one, so each test starts from its own. */
async function readyEstimate(): Promise<string> {
	const [src] = await db.select().from(schema.estimates).limit(1);
	const { id: _id, createdAt: _c, updatedAt: _u, ...rest } = src;
	const [e] = await db
		.insert(schema.estimates)
		.values({ ...rest, status: 'ready' })
		.returning({ id: schema.estimates.id });
	return e.id;
}

async function send(estimateId: string, validUntil = IN_30) {
	return svc.sendProposal(
		sales,
		estimateId,
		{ to: 'marisol.quenby@wrenfield.example', validUntil },
		BASE
	);
}

const tokenOf = (link: string) => link.slice(link.lastIndexOf('/') + 1);

async function tokenFromOutbox(proposalId: string): Promise<string> {
	const [m] = await db
		.select()
		.from(schema.mailOutbox)
		.where(eq(schema.mailOutbox.subjectId, proposalId));
	return tokenOf(linkIn(m.textBody));
}

const count = async (estimateId: string) =>
	(await db.select().from(schema.proposals).where(eq(schema.proposals.estimateId, estimateId)))
		.length;

describe('sending', () => {
	it('makes one proposal and one e-mail however often it is sent', async () => {
		const id = await readyEstimate();
		const first = await send(id);
		expect(first).toMatchObject({ version: 1, created: true, mailStatus: 'sent' });
		const again = await send(id);
		expect(again).toMatchObject({ proposalId: first.proposalId, version: 1, created: false });
		expect(await count(id)).toBe(1);
		const rows = await mail.listOutbox(db, companyId, { kind: 'proposal', id: first.proposalId });
		expect(rows).toHaveLength(1);
		expect(smtp.messages()).toHaveLength(1);
		const [e] = await db.select().from(schema.estimates).where(eq(schema.estimates.id, id));
		expect(e.status).toBe('sent');
	});

	it('stores only the SHA-256 of a 256-bit link token', async () => {
		const id = await readyEstimate();
		const { proposalId } = await send(id);
		const token = await tokenFromOutbox(proposalId);
		// base64url of 32 random bytes is 43 characters (RFC 4648 §5, no padding).
		expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
		const [p] = await db.select().from(schema.proposals).where(eq(schema.proposals.id, proposalId));
		const { createHash } = await import('node:crypto');
		expect(p.tokenHash).toBe(createHash('sha256').update(token).digest('hex'));
		expect(JSON.stringify(p)).not.toContain(token);
	});

	it('refuses an estimate that is not ready, and a role that may not send', async () => {
		const id = await readyEstimate();
		await db.update(schema.estimates).set({ status: 'draft' }).where(eq(schema.estimates.id, id));
		await expect(send(id)).rejects.toBeInstanceOf(errors.Conflict);
		await db.update(schema.estimates).set({ status: 'ready' }).where(eq(schema.estimates.id, id));
		await expect(
			svc.sendProposal(
				{ ...sales, role: 'estimator' },
				id,
				{ to: 'a@b.example', validUntil: IN_30 },
				BASE
			)
		).rejects.toBeInstanceOf(errors.Forbidden);
		expect(await count(id)).toBe(0);
	});

	it('makes a new version after the estimate changed, and never changes what was accepted', async () => {
		const id = await readyEstimate();
		const v1 = await send(id);
		const t1 = await tokenFromOutbox(v1.proposalId);
		// The estimate is re-priced (as a confirmed site visit does): a different frozen result.
		const [e] = await db.select().from(schema.estimates).where(eq(schema.estimates.id, id));
		const changed = structuredClone(e.result) as {
			price: { totalCents: number; depositCents: number };
		};
		changed.price.totalCents += 5_000;
		changed.price.depositCents = pctOf(changed.price.totalCents, 25);
		await db
			.update(schema.estimates)
			.set({ result: changed, totalCents: changed.price.totalCents })
			.where(eq(schema.estimates.id, id));
		const v2 = await send(id);
		expect(v2).toMatchObject({ version: 2, created: true });
		// The old link now says a newer version exists (410), and can't be answered.
		await expect(svc.openProposal(t1)).rejects.toBeInstanceOf(errors.Gone);
		const t2 = await tokenFromOutbox(v2.proposalId);
		const opened = await svc.openProposal(t2);
		expect(opened.snapshot.totalCents).toBe(changed.price.totalCents);

		const accepted = await svc.answerProposal(
			t2,
			{ decision: 'accepted', fullName: 'Marisol Quenby', extras: [] },
			meta
		);
		expect(accepted).toMatchObject({ proposalVersion: 2, totalCents: changed.price.totalCents });
		const [before] = await db
			.select()
			.from(schema.proposalAnswers)
			.where(eq(schema.proposalAnswers.proposalId, v2.proposalId));

		// A later change and send makes version 3; version 2's answer and snapshot stay as they were.
		changed.price.totalCents += 1_000;
		await db.update(schema.estimates).set({ result: changed }).where(eq(schema.estimates.id, id));
		expect((await send(id)).version).toBe(3);
		const [after] = await db
			.select()
			.from(schema.proposalAnswers)
			.where(eq(schema.proposalAnswers.proposalId, v2.proposalId));
		expect(after).toEqual(before);
		const [p2] = await db
			.select()
			.from(schema.proposals)
			.where(eq(schema.proposals.id, v2.proposalId));
		expect([p2.status, p2.totalCents]).toEqual(['accepted', accepted.totalCents]);
	});

	it('keeps a refused e-mail in the outbox, shows it, and the retry pass sends it', async () => {
		const id = await readyEstimate();
		smtp.refuse('temporary');
		const r = await send(id);
		expect(r.mailStatus).toBe('failed');
		expect(smtp.messages()).toHaveLength(0);
		const shown = await svc.proposalsOf(companyId, id, { validUntil: IN_30, salesperson: null });
		expect(shown.versions[0].mail[0]).toMatchObject({ status: 'failed', attempts: 1 });
		expect(shown.versions[0].mail[0].lastError).toMatch(/451/);

		smtp.refuse(null);
		// The retry loop's pass, two minutes on (the first wait is one minute).
		const later = new Date(Date.now() + 120_000);
		const counts = await mail.sendDueMail(db, mail.getMailTransport(), { now: later });
		expect(counts.sent).toBeGreaterThanOrEqual(1);
		expect(smtp.messages().flatMap((m) => m.to)).toContain('marisol.quenby@wrenfield.example');
		const again = await svc.proposalsOf(companyId, id, { validUntil: IN_30, salesperson: null });
		expect(again.versions[0].mail[0].status).toBe('sent');
	});
});

describe('the private link', () => {
	it('expires after its validity date (410) and stops taking answers', async () => {
		const id = await readyEstimate();
		const { proposalId } = await send(id, TOMORROW);
		const token = await tokenFromOutbox(proposalId);
		expect((await svc.openProposal(token)).status).toBe('open');
		const dayAfter = new Date(Date.now() + 2 * 86_400_000);
		await expect(svc.openProposal(token, dayAfter)).rejects.toBeInstanceOf(errors.Gone);
		await expect(
			svc.answerProposal(
				token,
				{ decision: 'accepted', fullName: 'M Q', extras: [] },
				meta,
				dayAfter
			)
		).rejects.toBeInstanceOf(errors.Gone);
		expect(
			await db
				.select()
				.from(schema.proposalAnswers)
				.where(eq(schema.proposalAnswers.proposalId, proposalId))
		).toHaveLength(0);
	});

	it('answers 404 once withdrawn, and sending again makes a new link', async () => {
		const id = await readyEstimate();
		const { proposalId } = await send(id);
		const token = await tokenFromOutbox(proposalId);
		await svc.revokeProposal(sales, id, proposalId);
		await expect(svc.openProposal(token)).rejects.toBeInstanceOf(errors.NotFound);
		await expect(svc.revokeProposal(sales, id, proposalId)).rejects.toBeInstanceOf(errors.Conflict);
		const next = await send(id);
		expect(next).toMatchObject({ version: 2, created: true });
		expect(await tokenFromOutbox(next.proposalId)).not.toBe(token);
	});

	it('answers 404 for a token it never made, without looking malformed ones up', async () => {
		await expect(svc.openProposal('x'.repeat(43))).rejects.toBeInstanceOf(errors.NotFound);
		await expect(svc.openProposal("' or 1=1 --")).rejects.toBeInstanceOf(errors.NotFound);
	});
});

describe('the answer', () => {
	it('is recorded once when two acceptances arrive at the same moment', async () => {
		const id = await readyEstimate();
		const { proposalId } = await send(id);
		const token = await tokenFromOutbox(proposalId);
		const tries = await Promise.allSettled([
			svc.answerProposal(
				token,
				{ decision: 'accepted', fullName: 'Marisol Quenby', extras: [] },
				meta
			),
			svc.answerProposal(
				token,
				{ decision: 'accepted', fullName: 'Marisol Quenby', extras: ['gutter_brightening'] },
				meta
			),
			svc.answerProposal(token, { decision: 'declined', reason: 'changed my mind' }, meta)
		]);
		expect(tries.filter((t) => t.status === 'fulfilled')).toHaveLength(1);
		for (const t of tries.filter((x) => x.status === 'rejected')) {
			expect((t as PromiseRejectedResult).reason).toBeInstanceOf(errors.Conflict);
		}
		const rows = await db
			.select()
			.from(schema.proposalAnswers)
			.where(eq(schema.proposalAnswers.proposalId, proposalId));
		expect(rows).toHaveLength(1);
	});

	it('prices ticked extras from the frozen offer and records version, revision and address', async () => {
		const id = await readyEstimate();
		const { proposalId } = await send(id);
		const token = await tokenFromOutbox(proposalId);
		const [p] = await db.select().from(schema.proposals).where(eq(schema.proposals.id, proposalId));
		const gutter = p.snapshot.extras.find((x) => x.code === 'gutter_brightening')!;
		expect(gutter.priceCents).toBeGreaterThan(0);
		await expect(
			svc.answerProposal(
				token,
				{ decision: 'accepted', fullName: 'M Q', extras: ['free_roof'] },
				meta
			)
		).rejects.toBeInstanceOf(errors.Invalid);
		const a = await svc.answerProposal(
			token,
			{ decision: 'accepted', fullName: 'Marisol Quenby', extras: ['gutter_brightening'] },
			meta
		);
		// Tax on extras at the card's rate (0% in the demo), deposit the card's 25% of the new
		// total: the model's own rule (pricing.ts), rounded half away from zero once.
		const total = p.totalCents + gutter.priceCents + pctOf(gutter.priceCents, p.taxPct);
		expect(a.totalCents).toBe(total);
		expect(a.depositCents).toBe(Math.min(total, pctOf(total, p.depositPct)));
		expect(a.extras).toEqual([
			{ code: 'gutter_brightening', label: gutter.label, priceCents: gutter.priceCents }
		]);
		const [row] = await db
			.select()
			.from(schema.proposalAnswers)
			.where(and(eq(schema.proposalAnswers.proposalId, proposalId)));
		expect(row).toMatchObject({
			decision: 'accepted',
			fullName: 'Marisol Quenby',
			consent: true,
			ipAddress: '203.0.113.7',
			proposalVersion: 1,
			estimateDigest: p.estimateDigest
		});
	});

	it('a decline moves the estimate to declined, with the reason kept', async () => {
		const id = await readyEstimate();
		const { proposalId } = await send(id);
		const token = await tokenFromOutbox(proposalId);
		await svc.answerProposal(
			token,
			{ decision: 'declined', reason: 'Going with a neighbour' },
			meta
		);
		const [e] = await db.select().from(schema.estimates).where(eq(schema.estimates.id, id));
		expect(e.status).toBe('declined');
		const shown = await svc.openProposal(token);
		expect(shown.answer).toMatchObject({
			decision: 'declined',
			declineReason: 'Going with a neighbour'
		});
	});
});

describe('the proposal document', () => {
	it('names facets by their labels, never by internal ids', async () => {
		const id = await readyEstimate();
		const shown = await svc.proposalsOf(companyId, id, { validUntil: IN_30, salesperson: null });
		const [e] = await db.select().from(schema.estimates).where(eq(schema.estimates.id, id));
		const facets = (e.result as { facets: { id: string; label?: string }[] }).facets;
		const text = JSON.stringify(shown.preview);
		for (const f of facets) expect(text).not.toContain(f.id);
		expect(shown.preview.scope.map((s) => s.facet)).toEqual(
			facets.map((f, i) => f.label?.trim() || `Facet ${i + 1}`)
		);
		expect(shown.preview.company).toMatchObject({ name: 'Harbor & Pine Exterior Care' });
	});
});
