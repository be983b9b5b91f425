// Deposits through the official SDK against the local payments fake: idempotent creation, the
// hosted pay page, signed webhooks verified with the SDK's constructEvent, replays and
// duplicates applied once, events out of order, tampering refused.
import http from 'node:http';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { eq } from 'drizzle-orm';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '$lib/server/db';
import type { PaymentsFake } from '$lib/server/fakes/payments';
import { freePort } from '../helpers/server';

const SECRET = 'whsec_test_clearpitch_payments_spec';
const dir = path.resolve('tmp/data', `payments-${process.pid}-${Date.now()}`);

let db: Db;
let fake: PaymentsFake;
let stripe: Stripe;
let receiver: http.Server;
let companyId: string;
let estimateIds: string[];
let pay: typeof import('$lib/server/payments');
let schema: typeof import('$lib/server/db/schema');
const received: { status: number; outcome?: string; error?: string }[] = [];
let onChangeCalls = 0;

beforeAll(async () => {
	process.env.CLEARPITCH_DATA_DIR = dir;
	process.env.DATABASE_URL = '';
	const { getDb } = await import('$lib/server/db');
	const { seedDemo } = await import('$lib/server/seed/demo');
	schema = await import('$lib/server/db/schema');
	pay = await import('$lib/server/payments');
	await seedDemo({ samples: true });
	db = await getDb();
	const rows = await db.select().from(schema.estimates);
	companyId = rows[0].companyId;
	estimateIds = rows.map((r) => r.id);

	// The app's webhook endpoint in miniature: raw body → verifyWebhook → applyPaymentEvent.
	receiver = http.createServer(async (req, res) => {
		const chunks: Buffer[] = [];
		for await (const c of req) chunks.push(c as Buffer);
		const raw = Buffer.concat(chunks).toString('utf8');
		try {
			const event = pay.verifyWebhook(raw, req.headers['stripe-signature'] as string, SECRET);
			const r = await pay.applyPaymentEvent(db, event, async () => {
				onChangeCalls++;
			});
			received.push({ status: 200, outcome: r.outcome });
			res.writeHead(200).end();
		} catch (e) {
			const status = e instanceof pay.WebhookSignatureError ? 400 : 500;
			received.push({ status, error: (e as Error).message });
			res.writeHead(status).end((e as Error).message);
		}
	});
	await new Promise<void>((r) => receiver.listen(0, '127.0.0.1', () => r()));
	const hook = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/webhook`;

	const { startPaymentsFake } = await import('$lib/server/fakes/payments');
	fake = await startPaymentsFake({ webhookUrl: hook, webhookSecret: SECRET });
	stripe = pay.createPaymentsClient({
		mode: 'local-fake',
		secretKey: 'sk_test_clearpitch_local_fake',
		webhookSecret: SECRET,
		fakeUrl: new URL(fake.url)
	});
});

afterAll(async () => {
	await fake?.close();
	await new Promise<void>((r) => (receiver ? receiver.close(() => r()) : r()));
	const { closeDb } = await import('$lib/server/db');
	await closeDb();
});

function deposit(estimateId: string, key: string, amountCents = 32_500) {
	return {
		companyId,
		estimateId,
		amountCents,
		description: 'Deposit — roof cleaning at 14 Tidewater Lane, Wrenfield',
		customerEmail: 'marisol.quenby@wrenfield.example',
		successUrl: 'http://localhost:3000/p/tok/paid?session={CHECKOUT_SESSION_ID}',
		cancelUrl: 'http://localhost:3000/p/tok',
		idempotencyKey: key
	};
}

async function checkoutRow(id: string) {
	const [r] = await db
		.select()
		.from(schema.depositCheckouts)
		.where(eq(schema.depositCheckouts.id, id));
	return r;
}

async function eventRows(id: string) {
	return db.select().from(schema.paymentEvents).where(eq(schema.paymentEvents.id, id));
}

describe('creating a deposit checkout', () => {
	it('makes one session for one idempotency key, even on a double click', async () => {
		const input = deposit(estimateIds[0], 'deposit:test-proposal-1:v1');
		const [a, b] = await Promise.all([
			pay.createCheckout(db, stripe, input),
			pay.createCheckout(db, stripe, input)
		]);
		const c = await pay.createCheckout(db, stripe, input);
		expect(b.id).toBe(a.id);
		expect(c.id).toBe(a.id);
		expect(
			fake.sessions().filter((s) => s.metadata.idempotencyKey === input.idempotencyKey)
		).toHaveLength(1);
		const rows = await db
			.select()
			.from(schema.depositCheckouts)
			.where(eq(schema.depositCheckouts.idempotencyKey, input.idempotencyKey));
		expect(rows).toHaveLength(1);
		expect(rows[0]).toMatchObject({ amountCents: 32_500, status: 'open', currency: 'usd' });
		// What the SDK reads back from the service matches.
		const s = await stripe.checkout.sessions.retrieve(a.id);
		expect(s.amount_total).toBe(32_500);
		expect(s.metadata?.estimateId).toBe(estimateIds[0]);
	});

	it('refuses the same key with other details, and stores nothing more', async () => {
		const key = 'deposit:test-proposal-2:v1';
		await pay.createCheckout(db, stripe, deposit(estimateIds[1], key));
		const err = await pay
			.createCheckout(db, stripe, deposit(estimateIds[1], key, 99_900))
			.catch((e) => e);
		expect(err).toBeInstanceOf(pay.PaymentServiceError);
		expect(err.kind).toBe('idempotency');
		const rows = await db
			.select()
			.from(schema.depositCheckouts)
			.where(eq(schema.depositCheckouts.idempotencyKey, key));
		expect(rows.map((r) => r.amountCents)).toEqual([32_500]);
	});

	it('refuses amounts that are not whole cents, and a service that cannot be reached', async () => {
		await expect(
			pay.createCheckout(db, stripe, deposit(estimateIds[2], 'deposit:bad-amount:v1', 125.5))
		).rejects.toThrow();
		const down = pay.createPaymentsClient({
			mode: 'local-fake',
			secretKey: 'sk_test_x',
			webhookSecret: SECRET,
			fakeUrl: new URL(`http://127.0.0.1:${await freePort()}`)
		});
		const err = await pay
			.createCheckout(db, down, deposit(estimateIds[2], 'deposit:unreachable:v1'))
			.catch((e) => e);
		expect(err).toBeInstanceOf(pay.PaymentServiceError);
		expect(err.kind).toBe('unreachable');
		const rows = await db
			.select()
			.from(schema.depositCheckouts)
			.where(eq(schema.depositCheckouts.estimateId, estimateIds[2]));
		expect(rows).toHaveLength(0);
	});
});

describe('the pay page and its webhooks', () => {
	it('pays on the hosted page: signed event verified, checkout complete, sent back to success', async () => {
		const c = await pay.createCheckout(db, stripe, deposit(estimateIds[3], 'deposit:pay:v1'));
		const page = await fetch(c.url);
		expect(page.status).toBe(200);
		const htmlText = await page.text();
		expect(htmlText).toContain('Pay 325.00 USD');
		expect(htmlText).toContain('Cancel');

		const before = received.length;
		const res = await fetch(c.url, {
			method: 'POST',
			redirect: 'manual',
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
			body: 'action=pay'
		});
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe(`http://localhost:3000/p/tok/paid?session=${c.id}`);
		expect(received.slice(before)).toEqual([{ status: 200, outcome: 'applied' }]);
		const row = await checkoutRow(c.id);
		expect(row.status).toBe('complete');
		expect(row.amountPaidCents).toBe(32_500);
		expect(row.paidAt).toBeInstanceOf(Date);
		expect((await stripe.checkout.sessions.retrieve(c.id)).payment_status).toBe('paid');
	});

	it('applies a replayed or duplicated event once', async () => {
		const c = await pay.createCheckout(db, stripe, deposit(estimateIds[4], 'deposit:replay:v1'));
		const calls = onChangeCalls;
		const event = await fake.pay(c.id);
		expect(onChangeCalls).toBe(calls + 1);
		const after = await checkoutRow(c.id);

		const before = received.length;
		const d1 = await fake.redeliver(event.id);
		const d2 = await fake.redeliver(event.id);
		expect([d1.status, d2.status]).toEqual([200, 200]);
		expect(received.slice(before).map((r) => r.outcome)).toEqual(['duplicate', 'duplicate']);
		expect(onChangeCalls).toBe(calls + 1);
		expect(await eventRows(event.id)).toHaveLength(1);
		const again = await checkoutRow(c.id);
		expect(again.updatedAt.getTime()).toBe(after.updatedAt.getTime());
		expect(again.amountPaidCents).toBe(32_500);
	});

	it('cancels: the session expires, the customer goes back, nothing is paid', async () => {
		const c = await pay.createCheckout(db, stripe, deposit(estimateIds[5], 'deposit:cancel:v1'));
		const res = await fetch(c.url, {
			method: 'POST',
			redirect: 'manual',
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
			body: 'action=cancel'
		});
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe('http://localhost:3000/p/tok');
		const row = await checkoutRow(c.id);
		expect(row.status).toBe('expired');
		expect(row.paidAt).toBeNull();
		// A second click on a finished page changes nothing.
		const again = await fetch(c.url, {
			method: 'POST',
			body: 'action=pay',
			headers: { 'content-type': 'application/x-www-form-urlencoded' }
		});
		expect(again.status).toBe(409);
		expect((await checkoutRow(c.id)).status).toBe('expired');
	});

	it('handles events out of order: paid stays paid, and an event may come before our record', async () => {
		// A late "expired" for a checkout already paid is ignored.
		const c = await pay.createCheckout(
			db,
			stripe,
			deposit(estimateIds[0], 'deposit:order:v1', 10_000)
		);
		const paid = await fake.pay(c.id);
		const late = {
			...paid,
			id: 'evt_test_late_expired_0001',
			type: 'checkout.session.expired',
			created: paid.created - 60,
			data: { object: { ...paid.data.object, status: 'expired', payment_status: 'unpaid' } }
		};
		const r = await pay.applyPaymentEvent(db, late as unknown as Stripe.Event);
		expect(r.outcome).toBe('ignored');
		const row = await checkoutRow(c.id);
		expect(row.status).toBe('complete');
		expect(row.amountPaidCents).toBe(10_000);

		// The service's "completed" reaches us before our own row is written: the event creates
		// it, and the later insert from the create call keeps what the event wrote.
		const s = await stripe.checkout.sessions.create(
			{
				mode: 'payment',
				line_items: [
					{
						quantity: 1,
						price_data: { currency: 'usd', unit_amount: 20_000, product_data: { name: 'Deposit' } }
					}
				],
				metadata: {
					kind: 'deposit',
					companyId,
					estimateId: estimateIds[1],
					idempotencyKey: 'deposit:early:v1'
				},
				success_url: 'http://localhost:3000/ok',
				cancel_url: 'http://localhost:3000/no'
			},
			{ idempotencyKey: 'deposit:early:v1' }
		);
		expect(await checkoutRow(s.id)).toBeUndefined();
		await fake.pay(s.id);
		const early = await checkoutRow(s.id);
		expect(early).toMatchObject({
			status: 'complete',
			amountCents: 20_000,
			amountPaidCents: 20_000,
			estimateId: estimateIds[1]
		});
	});

	it('refuses a tampered body, a wrong secret, a stale or missing signature, and records nothing', async () => {
		const c = await pay.createCheckout(db, stripe, deposit(estimateIds[2], 'deposit:tamper:v1'));
		const s = fake.sessions().find((x) => x.id === c.id)!;
		const event = {
			id: 'evt_test_tampered_0001',
			object: 'event',
			type: 'checkout.session.completed',
			created: Math.floor(Date.now() / 1000),
			data: { object: { ...s, status: 'complete', payment_status: 'paid' } }
		};
		const payload = JSON.stringify(event);
		const good = Stripe.webhooks.generateTestHeaderString({ payload, secret: SECRET });
		const hook = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/webhook`;
		const post = (body: string, sig?: string) =>
			fetch(hook, {
				method: 'POST',
				headers: {
					'content-type': 'application/json',
					...(sig ? { 'stripe-signature': sig } : {})
				},
				body
			});

		const tampered = payload.replace('"amount_total":32500', '"amount_total":1');
		expect(tampered).not.toBe(payload);
		expect((await post(tampered, good)).status).toBe(400);
		const wrongSecret = Stripe.webhooks.generateTestHeaderString({
			payload,
			secret: 'whsec_other'
		});
		expect((await post(payload, wrongSecret)).status).toBe(400);
		// Older than the SDK's default 300 s tolerance.
		const stale = Stripe.webhooks.generateTestHeaderString({
			payload,
			secret: SECRET,
			timestamp: Math.floor(Date.now() / 1000) - 301
		});
		expect((await post(payload, stale)).status).toBe(400);
		expect((await post(payload)).status).toBe(400);
		expect(await eventRows(event.id)).toHaveLength(0);
		expect((await checkoutRow(c.id)).status).toBe('open');

		// The same payload, correctly signed, is taken.
		expect((await post(payload, good)).status).toBe(200);
		expect((await checkoutRow(c.id)).status).toBe('complete');
	});

	it('records an event about nothing of ours as unrelated, and changes nothing', async () => {
		const r = await pay.applyPaymentEvent(db, {
			id: 'evt_test_unrelated_0001',
			object: 'event',
			type: 'checkout.session.completed',
			created: 1_780_000_000,
			data: {
				object: {
					id: 'cs_test_other',
					object: 'checkout.session',
					metadata: {
						kind: 'deposit',
						companyId,
						estimateId: '00000000-0000-4000-8000-000000000000'
					}
				}
			}
		} as unknown as Stripe.Event);
		expect(r.outcome).toBe('unrelated');
		expect(await checkoutRow('cs_test_other')).toBeUndefined();
		expect((await eventRows('evt_test_unrelated_0001'))[0].outcome).toBe('unrelated');
	});
});
