// The outbox end to end: nodemailer → the local SMTP fake (smtp-server + mailparser) → read back
// parsed; a refusal retried with back-off; the same idempotency key sends one message.
import fs from 'node:fs';
import path from 'node:path';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Db } from '$lib/server/db';
import type { SmtpFake } from '$lib/server/fakes/smtp';

const dir = path.resolve('tmp/data', `mail-${process.pid}-${Date.now()}`);
let db: Db;
let fake: SmtpFake;
let companyId: string;
let mail: typeof import('$lib/server/mail');
let schema: typeof import('$lib/server/db/schema');

beforeAll(async () => {
	process.env.CLEARPITCH_DATA_DIR = dir;
	process.env.DATABASE_URL = '';
	const { getDb } = await import('$lib/server/db');
	schema = await import('$lib/server/db/schema');
	mail = await import('$lib/server/mail');
	const { startSmtpFake } = await import('$lib/server/fakes/smtp');
	db = await getDb();
	const [c] = await db
		.insert(schema.companies)
		.values({ name: 'Harbor & Pine Exterior Care' })
		.returning();
	companyId = c.id;
	fake = await startSmtpFake({ storeFile: path.join(dir, '..', `mail-${process.pid}.json`) });
});

afterAll(async () => {
	await fake?.close();
	const { closeDb } = await import('$lib/server/db');
	await closeDb();
});

beforeEach(() => {
	fake.refuse(null);
	fake.clear();
});

function proposalMessage(key: string) {
	const built = mail.buildProposalEmail({
		companyName: 'Harbor & Pine Exterior Care',
		customerName: 'Marisol Quenby',
		siteAddress: '14 Tidewater Lane, Wrenfield',
		proposalVersion: 1,
		totalCents: 98_000,
		depositCents: 24_500,
		validUntil: '2026-06-30',
		link: 'http://localhost:3000/p/demo-token-abcdefghijklmnopqrstuvwxyz'
	});
	return {
		companyId,
		idempotencyKey: key,
		from: 'Harbor & Pine <office@harborpine.example>',
		to: 'marisol.quenby@wrenfield.example',
		...built
	};
}

async function row(id: string) {
	const [r] = await db.select().from(schema.mailOutbox).where(eq(schema.mailOutbox.id, id));
	return r;
}

describe('mail outbox through the SMTP fake', () => {
	it('sends a queued message and the fake receives it parsed, text and HTML', async () => {
		const transport = mail.createMailTransport(fake.url)!;
		const q = await mail.enqueueMail(db, proposalMessage('proposal:p1:v1'));
		expect(q).toMatchObject({ created: true, status: 'queued' });
		expect(await mail.sendQueuedMail(db, transport, q.id)).toBe('sent');

		const got = fake.messages();
		expect(got).toHaveLength(1);
		expect(got[0].envelope.to).toEqual(['marisol.quenby@wrenfield.example']);
		expect(got[0].subject).toContain('14 Tidewater Lane, Wrenfield');
		expect(got[0].text).toContain('Deposit to book: $245.00');
		expect(got[0].html).toContain(
			'href="http://localhost:3000/p/demo-token-abcdefghijklmnopqrstuvwxyz"'
		);
		const r = await row(q.id);
		expect(r.status).toBe('sent');
		expect(r.attempts).toBe(1);
		expect(got[0].messageId).toBe(r.messageId);

		// The fake's HTTP inbox and its JSON file say the same (what the Outbox page reads).
		const inbox = await mail.readFakeInbox(fake.inboxUrl);
		expect(inbox?.map((m) => m.id)).toEqual([got[0].id]);
		const file = JSON.parse(
			fs.readFileSync(path.join(dir, '..', `mail-${process.pid}.json`), 'utf8')
		);
		expect(file[0].subject).toBe(got[0].subject);
	});

	it('makes one message for one idempotency key, however often it is asked', async () => {
		const transport = mail.createMailTransport(fake.url)!;
		const a = await mail.enqueueMail(db, proposalMessage('proposal:p2:v1'));
		const b = await mail.enqueueMail(db, {
			...proposalMessage('proposal:p2:v1'),
			subject: 'changed'
		});
		expect(b).toMatchObject({ id: a.id, created: false });
		await mail.sendDueMail(db, transport);
		await mail.sendDueMail(db, transport);
		expect(await mail.sendQueuedMail(db, transport, a.id)).toBeNull();
		expect(fake.messages()).toHaveLength(1);
		expect(fake.messages()[0].subject).not.toBe('changed');
		const rows = await db
			.select()
			.from(schema.mailOutbox)
			.where(eq(schema.mailOutbox.idempotencyKey, 'proposal:p2:v1'));
		expect(rows).toHaveLength(1);
		// A new version is a new key, so a new message.
		const c = await mail.enqueueMail(db, proposalMessage('proposal:p2:v2'));
		expect(c.created).toBe(true);
		expect(await mail.sendQueuedMail(db, transport, c.id)).toBe('sent');
		expect(fake.messages()).toHaveLength(2);
	});

	it('records a temporary refusal, waits, then retries and sends once', async () => {
		const transport = mail.createMailTransport(fake.url)!;
		const t0 = new Date();
		const q = await mail.enqueueMail(db, proposalMessage('proposal:p3:v1'), t0);
		fake.refuse('temporary');
		expect(await mail.sendQueuedMail(db, transport, q.id, { now: t0 })).toBe('failed');
		let r = await row(q.id);
		expect(r.status).toBe('failed');
		expect(r.attempts).toBe(1);
		expect(r.lastError).toMatch(/SMTP 451/);
		expect(r.nextAttemptAt.getTime()).toBe(t0.getTime() + 60_000);
		expect(fake.messages()).toHaveLength(0);

		fake.refuse(null);
		// Not due yet at +30 s: nothing is tried.
		expect(await mail.sendDueMail(db, transport, { now: new Date(t0.getTime() + 30_000) })).toEqual(
			{
				sent: 0,
				failed: 0,
				dead: 0
			}
		);
		expect(fake.messages()).toHaveLength(0);
		const pass = await mail.sendDueMail(db, transport, { now: new Date(t0.getTime() + 61_000) });
		expect(pass.sent).toBe(1);
		r = await row(q.id);
		expect(r.status).toBe('sent');
		expect(r.attempts).toBe(2);
		expect(r.lastError).toBeNull();
		expect(fake.messages()).toHaveLength(1);
	});

	it('marks a permanent refusal dead (shown, not retried) until a person retries it', async () => {
		const transport = mail.createMailTransport(fake.url)!;
		const q = await mail.enqueueMail(db, proposalMessage('proposal:p4:v1'));
		fake.refuse('permanent');
		expect(await mail.sendQueuedMail(db, transport, q.id)).toBe('dead');
		expect((await row(q.id)).lastError).toMatch(/SMTP 550/);
		const later = new Date(Date.now() + 24 * 3600_000);
		expect((await mail.sendDueMail(db, transport, { now: later })).sent).toBe(0);
		const listed = await mail.listOutbox(db, companyId);
		expect(listed.find((m) => m.id === q.id)?.status).toBe('dead');

		fake.refuse(null);
		expect(await mail.retryMailNow(db, companyId, q.id)).toBe(true);
		expect(await mail.sendQueuedMail(db, transport, q.id)).toBe('sent');
		expect(fake.messages()).toHaveLength(1);
		// Another company cannot requeue it.
		expect(await mail.retryMailNow(db, '00000000-0000-4000-8000-000000000000', q.id)).toBe(false);
	});

	it('keeps the message when no server answers or none is configured, and gives up after the last try', async () => {
		const { freePort } = await import('../helpers/server');
		const dead = mail.createMailTransport(`smtp://127.0.0.1:${await freePort()}`)!;
		const q = await mail.enqueueMail(db, proposalMessage('proposal:p5:v1'));
		expect(await mail.sendQueuedMail(db, dead, q.id)).toBe('failed');
		expect((await row(q.id)).lastError).toMatch(/ECONNREFUSED/);

		const q2 = await mail.enqueueMail(db, proposalMessage('proposal:p6:v1'));
		const policy = { firstDelayMs: 1, maxDelayMs: 1, maxAttempts: 2 };
		expect(await mail.sendQueuedMail(db, null, q2.id, { policy })).toBe('failed');
		expect((await row(q2.id)).lastError).toMatch(/CLEARPITCH_SMTP_URL/);
		const soon = new Date(Date.now() + 1000);
		expect(await mail.sendQueuedMail(db, null, q2.id, { policy, now: soon })).toBe('dead');
		expect((await row(q2.id)).attempts).toBe(2);
	});
});
