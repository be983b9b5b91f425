// The proposal loop over HTTP against the built server with the local SMTP and payment fakes:
// send (twice makes one), the customer's page for live, withdrawn and expired links, acceptance
// with tampered prices, one answer under concurrent accepts, the deposit (one session for a
// double click, paid, cancelled and paid again) and the webhook route under tampering, replay,
// duplicates and events out of order.
import { openPglite } from '../helpers/pglite';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { money } from '../../src/lib/components/estimate/format';
import { pctOf } from '../../src/lib/estimating/money';
import { startTestFakes, TEST_WEBHOOK_SECRET, type TestFakes } from '../helpers/fakes';
import { signIn } from '../helpers/http';
import { linkIn, readyEstimate } from '../helpers/proposal';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { prepareDataDir, type Prepared } from './api-helpers';

let server: TestServer;
let fakes: TestFakes;
let prep: Prepared;
let dir: string;
let salesCookie = '';
let estimatorCookie = '';
let ownerCookie = '';
const est: Record<string, { id: string; totalCents: number; depositCents: number }> = {};
let expiredLink = '';
const IN_30 = new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10);
const TOMORROW = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
let client = 0;

async function sessionFor(role: keyof typeof DEMO): Promise<string> {
	const r = await signIn(server.url, DEMO[role], undefined, {
		'x-forwarded-for': `198.51.100.${++client % 250}`
	});
	if (!r.cookie) throw new Error(`Sign-in as ${role} failed with ${r.status}`);
	return r.cookie;
}

async function post(path: string, cookie: string | null, fields: [string, string][]) {
	const res = await fetch(server.url + path, {
		method: 'POST',
		redirect: 'manual',
		headers: {
			'content-type': 'application/x-www-form-urlencoded',
			accept: 'text/html',
			origin: server.url,
			'x-forwarded-for': `198.51.100.${++client % 250}`,
			...(cookie ? { cookie } : {})
		},
		body: new URLSearchParams(fields).toString()
	});
	return { status: res.status, text: await res.text(), headers: res.headers };
}

async function get(path: string, cookie?: string) {
	const res = await fetch(path.startsWith('http') ? path : server.url + path, {
		redirect: 'manual',
		headers: { accept: 'text/html', ...(cookie ? { cookie } : {}) }
	});
	return { status: res.status, text: await res.text(), headers: res.headers };
}

async function statusOf(estimateId: string): Promise<string> {
	const res = await fetch(`${server.url}/api/estimates/${estimateId}`, {
		headers: { authorization: `Bearer ${prep.ownerToken}` }
	});
	return ((await res.json()) as { status: string }).status;
}

/** Sends the estimate's proposal as sales and returns the private link from the e-mail. */
async function sendAndLink(house: string, validUntil = IN_30): Promise<string> {
	const before = fakes.smtp.messages().length;
	const r = await post(`/estimates/${est[house].id}/proposal?/send`, salesCookie, [
		['to', `${house}@wrenfield.example`],
		['validUntil', validUntil]
	]);
	expect(r.status).toBe(200);
	expect(r.text).toContain('Version 1 sent to');
	const mails = fakes.smtp.messages();
	expect(mails).toHaveLength(before + 1);
	return linkIn(mails.at(-1)!.text);
}

/** The link in the e-mail a house's customer received. */
function linkOf(house: string): string {
	const m = fakes.smtp.messages().find((x) => x.to.includes(`${house}@wrenfield.example`));
	if (!m) throw new Error(`No e-mail to ${house}`);
	return linkIn(m.text);
}

/** The price the page offers for an extra, as shown to the customer. */
function extraPrice(html: string, label: string): number {
	const m = new RegExp(`${label}[\\s\\S]*?\\+\\$([\\d,.]+)`).exec(html);
	if (!m) throw new Error(`No price for ${label}`);
	return Math.round(Number(m[1].replace(/,/g, '')) * 100);
}

async function accept(link: string, extra: [string, string][] = []) {
	return post(`${new URL(link).pathname}?/accept`, null, [
		['fullName', 'Marisol Quenby'],
		['consent', 'yes'],
		...extra
	]);
}

async function startPay(link: string): Promise<string> {
	const r = await post(`${new URL(link).pathname}?/pay`, null, []);
	expect(r.status).toBe(200);
	const m = /https?:\/\/127\.0\.0\.1:\d+\/pay\/cs_[A-Za-z0-9_]+/.exec(r.text);
	if (!m) throw new Error(`No pay page in the answer: ${r.text.slice(0, 300)}`);
	return m[0];
}

const sessionIdOf = (payUrl: string) => payUrl.slice(payUrl.lastIndexOf('/') + 1);

async function postEvent(payload: string, signature: string | null) {
	const res = await fetch(`${server.url}/api/payments/webhook`, {
		method: 'POST',
		headers: {
			'content-type': 'application/json',
			...(signature ? { 'stripe-signature': signature } : {})
		},
		body: payload
	});
	return { status: res.status, body: await res.text() };
}

/** An event as the service would send it, signed with the test secret (or another). */
function signedEvent(
	type: string,
	session: object,
	created: number,
	secret = TEST_WEBHOOK_SECRET
): { payload: string; header: string } {
	const payload = JSON.stringify({
		id: `evt_test_${Math.random().toString(36).slice(2)}`,
		object: 'event',
		type,
		created,
		api_version: Stripe.API_VERSION,
		livemode: false,
		pending_webhooks: 1,
		data: { object: session }
	});
	return { payload, header: Stripe.webhooks.generateTestHeaderString({ payload, secret }) };
}

beforeAll(async () => {
	dir = seededDataDir('proposals-http');
	prep = await prepareDataDir(dir);
	fakes = await startTestFakes();
	const env = { ...fakes.env, ADDRESS_HEADER: 'x-forwarded-for', XFF_DEPTH: '1' };
	server = await startServer(dir, env);
	fakes.payments.setWebhookUrl(`${server.url}/api/payments/webhook`);
	for (const h of ['h01', 'h02', 'h03', 'h04', 'h06', 'h07', 'h08', 'h09']) {
		est[h] = await readyEstimate(server.url, prep, h);
	}
	salesCookie = await sessionFor('sales');
	// An expired link: sent good until tomorrow, then moved into the past with the server stopped
	// (PGlite opens a data directory in one process at a time).
	expiredLink = await sendAndLink('h09', TOMORROW);
	await server.stop();
	const db = openPglite(dir);
	await db.waitReady;
	await db.query(`update proposals set valid_until = current_date - 1 where estimate_id = $1`, [
		est.h09.id
	]);
	await db.close();
	server = await startServer(dir, env);
	fakes.payments.setWebhookUrl(`${server.url}/api/payments/webhook`);
	salesCookie = await sessionFor('sales');
	estimatorCookie = await sessionFor('estimator');
	ownerCookie = await sessionFor('owner');
}, 300_000);

afterAll(async () => {
	await server?.stop();
	await fakes?.stop();
});

describe('sending', () => {
	it('a second send makes no second proposal and no second e-mail', async () => {
		const link = await sendAndLink('h01');
		const again = await post(`/estimates/${est.h01.id}/proposal?/send`, salesCookie, [
			['to', 'h01@wrenfield.example'],
			['validUntil', IN_30]
		]);
		expect(again.status).toBe(200);
		expect(again.text).toContain('Version 1 is already with the customer; nothing new was sent.');
		expect(fakes.smtp.messages().filter((m) => m.text?.includes(link))).toHaveLength(1);
		expect(await statusOf(est.h01.id)).toBe('sent');
		const page = await get(`/estimates/${est.h01.id}/proposal`, salesCookie);
		expect(page.text.match(/data-testid="proposal-status"/g)).toHaveLength(1);
	});

	it('refuses bad input with field messages, and the estimator role, sending nothing', async () => {
		const before = fakes.smtp.messages().length;
		const bad = await post(`/estimates/${est.h02.id}/proposal?/send`, salesCookie, [
			['to', 'not an address'],
			['validUntil', '2020-01-01']
		]);
		expect(bad.status).toBe(400);
		expect(bad.text).toContain('Enter the customer’s e-mail address');
		expect(bad.text).toContain('The proposal must be good until a day after today at least.');
		const estimator = await post(`/estimates/${est.h02.id}/proposal?/send`, estimatorCookie, [
			['to', 'h02@wrenfield.example'],
			['validUntil', IN_30]
		]);
		expect(estimator.status).toBe(403);
		expect(fakes.smtp.messages()).toHaveLength(before);
		expect(await statusOf(est.h02.id)).toBe('ready');
	});

	it('shows a refused e-mail on the estimate, and "Retry now" sends it', async () => {
		fakes.smtp.refuse('temporary');
		const r = await post(`/estimates/${est.h08.id}/proposal?/send`, salesCookie, [
			['to', 'h08@wrenfield.example'],
			['validUntil', IN_30]
		]);
		fakes.smtp.refuse(null);
		expect(r.status).toBe(200);
		expect(r.text).toContain('could not be delivered yet');
		const page = await get(`/estimates/${est.h08.id}`, salesCookie);
		expect(page.text).toContain('data-testid="panel-mail-problem"');
		expect(page.text).toMatch(/not delivered yet, will retry: SMTP 451/);
		const proposalPage = await get(`/estimates/${est.h08.id}/proposal`, salesCookie);
		const mailId = /name="mailId" value="([0-9a-f-]{36})"/.exec(proposalPage.text)![1];
		const retry = await post(`/estimates/${est.h08.id}/proposal?/retryMail`, salesCookie, [
			['mailId', mailId]
		]);
		expect(retry.status).toBe(200);
		expect(retry.text).toContain('The e-mail went out.');
		expect(fakes.smtp.messages().flatMap((m) => m.to)).toContain('h08@wrenfield.example');
	});

	it('shows the outbox and what the SMTP fake received to the owner only', async () => {
		const owner = await get('/outbox', ownerCookie);
		expect(owner.status).toBe(200);
		expect(owner.text).toContain('Your roof cleaning proposal from Harbor &amp; Pine');
		expect(owner.text).toContain('data-testid="fake-inbox"');
		expect((await get('/outbox', salesCookie)).status).toBe(403);
	});
});

describe("the customer's page", () => {
	it('shows a live link privately, and 404 for a link it never made', async () => {
		const link = await sendAndLink('h02');
		const r = await get(link);
		expect(r.status).toBe(200);
		expect(r.text).toContain('18 Tidewater Lane, Wrenfield');
		expect(r.headers.get('cache-control')).toBe('private, no-store');
		expect(r.headers.get('referrer-policy')).toBe('no-referrer');
		expect((await get(`/p/${'A'.repeat(43)}`)).status).toBe(404);
		expect((await get('/p/short')).status).toBe(404);
	});

	it('answers 404 with a clear page once sales withdraws the link', async () => {
		const link = await sendAndLink('h03');
		const page = await get(`/estimates/${est.h03.id}/proposal`, salesCookie);
		const proposalId = /name="proposalId" value="([0-9a-f-]{36})"/.exec(page.text)![1];
		const r = await post(`/estimates/${est.h03.id}/proposal?/revoke`, salesCookie, [
			['proposalId', proposalId]
		]);
		expect(r.status).toBe(200);
		const gone = await get(link);
		expect(gone.status).toBe(404);
		expect(gone.text).toContain('This proposal link was withdrawn.');
		expect(gone.text).not.toContain('Accept this proposal');
		expect((await accept(link)).status).toBe(404);
	});

	it('answers 410 with a clear page past the validity date, and takes no answer', async () => {
		// The server was restarted on another port since the e-mail went out.
		const r = await get(new URL(expiredLink).pathname);
		expect(r.status).toBe(410);
		expect(r.text).toContain('has expired');
		expect(r.text).not.toContain('Accept this proposal');
		expect((await accept(expiredLink)).status).toBe(410);
		expect(await statusOf(est.h09.id)).toBe('sent');
	});

	it('prices ticked extras on the server: prices in the form are ignored', async () => {
		const link = await sendAndLink('h04');
		const gutter = extraPrice((await get(link)).text, 'Gutter brightening');
		const r = await accept(link, [
			['extras', 'gutter_brightening'],
			['priceCents', '1'],
			['totalCents', '100'],
			['depositCents', '50'],
			['extras[0][priceCents]', '1']
		]);
		expect(r.status).toBe(200);
		// Demo card: 0% tax, 25% deposit (src/lib/estimating/rate-card.ts defaults).
		const total = est.h04.totalCents + gutter;
		const page = await get(link);
		expect(page.text).toContain(money(total));
		// The deposit charged is the server's, from the accepted total.
		const payUrl = await startPay(link);
		const session = fakes.payments.sessions().find((s) => s.id === sessionIdOf(payUrl))!;
		expect(session.amount_total).toBe(pctOf(total, 25));
		// A second acceptance changes nothing.
		const again = await accept(link);
		expect(again.status).toBe(409);
	});

	it('refuses an unknown extra and a missing signature or consent with field messages', async () => {
		const link = await sendAndLink('h06');
		const unknown = await accept(link, [['extras', 'free_roof']]);
		expect(unknown.status).toBe(400);
		const noName = await post(`${new URL(link).pathname}?/accept`, null, [['consent', 'yes']]);
		expect(noName.status).toBe(400);
		expect(noName.text).toContain('Type your full name to sign.');
		const noConsent = await post(`${new URL(link).pathname}?/accept`, null, [
			['fullName', 'Marisol Quenby']
		]);
		expect(noConsent.status).toBe(400);
		expect(noConsent.text).toContain('Tick the box to agree');
		expect((await get(link)).text).toContain('Accept this proposal');
	});

	it('records one answer when two acceptances arrive at once', async () => {
		const link = await sendAndLink('h07');
		const both = await Promise.all([accept(link), accept(link, [['extras', 'siding_post_rinse']])]);
		expect(both.map((r) => r.status).sort()).toEqual([200, 409]);
	});
});

describe('the deposit and the webhook', () => {
	it('a double click makes one checkout session', async () => {
		const link = linkOf('h06');
		expect((await accept(link)).status).toBe(200);
		const [a, b] = await Promise.all([startPay(link), startPay(link)]);
		expect(a).toBe(b);
		expect(await startPay(link)).toBe(a);
	});

	it('refuses a tampered, unsigned or wrongly signed event with 400, changing nothing', async () => {
		const live = linkOf('h01');
		expect((await accept(live)).status).toBe(200);
		const payUrl = await startPay(live);
		const session = fakes.payments.sessions().find((s) => s.id === sessionIdOf(payUrl))!;
		const paid = { ...session, status: 'complete', payment_status: 'paid' };
		const now = Math.floor(Date.now() / 1000);
		const ev = signedEvent('checkout.session.completed', paid, now);
		const tampered = ev.payload.replace(
			`"amount_total":${session.amount_total}`,
			'"amount_total":1'
		);
		expect(tampered).not.toBe(ev.payload);
		expect((await postEvent(tampered, ev.header)).status).toBe(400);
		expect((await postEvent(ev.payload, null)).status).toBe(400);
		const other = signedEvent('checkout.session.completed', paid, now, 'whsec_someone_else');
		expect((await postEvent(other.payload, other.header)).status).toBe(400);
		expect(await statusOf(est.h01.id)).toBe('sent');
		expect((await get(live)).text).not.toContain('data-testid="deposit-paid"');
	});

	it('applies a paid event once: replays and duplicates answer 200 and change nothing', async () => {
		const live = linkOf('h01');
		const payUrl = await startPay(live);
		const event = await fakes.payments.pay(sessionIdOf(payUrl));
		expect(fakes.payments.deliveries().find((d) => d.eventId === event.id)?.status).toBe(200);
		expect(await statusOf(est.h01.id)).toBe('accepted');
		const replay = await fakes.payments.redeliver(event.id);
		expect(replay.status).toBe(200);
		const dup = signedEvent('checkout.session.completed', event.data.object, event.created);
		const sameId = dup.payload.replace(/"id":"evt_test_[a-z0-9]+"/, `"id":"${event.id}"`);
		const again = await postEvent(
			sameId,
			Stripe.webhooks.generateTestHeaderString({ payload: sameId, secret: TEST_WEBHOOK_SECRET })
		);
		expect(again.status).toBe(200);
		expect(JSON.parse(again.body).outcome).toBe('duplicate');
		const office = await get(`/estimates/${est.h01.id}`, salesCookie);
		expect(office.text).toContain(`${money(event.data.object.amount_total)}</span> paid`);
		expect(await statusOf(est.h01.id)).toBe('accepted');
	});

	it('handles events out of order: an older "expired" after "paid" is ignored', async () => {
		const link = linkOf('h06');
		const payUrl = await startPay(link);
		const session = fakes.payments.sessions().find((s) => s.id === sessionIdOf(payUrl))!;
		const now = Math.floor(Date.now() / 1000);
		const paid = signedEvent(
			'checkout.session.completed',
			{ ...session, status: 'complete', payment_status: 'paid' },
			now
		);
		const expired = signedEvent(
			'checkout.session.expired',
			{ ...session, status: 'expired' },
			now - 60
		);
		expect(JSON.parse((await postEvent(paid.payload, paid.header)).body).outcome).toBe('applied');
		expect(JSON.parse((await postEvent(expired.payload, expired.header)).body).outcome).toBe(
			'ignored'
		);
		expect(await statusOf(est.h06.id)).toBe('accepted');
		expect((await get(link)).text).toContain('data-testid="deposit-paid"');
	});

	it('a cancelled payment leaves it accepted-unpaid, and the customer can pay again', async () => {
		const link = linkOf('h07');
		const first = await startPay(link);
		await fakes.payments.cancel(sessionIdOf(first));
		expect(await statusOf(est.h07.id)).toBe('sent');
		const back = await get(`${link}?deposit=cancelled`);
		expect(back.text).toContain('The payment was cancelled and nothing was charged.');
		expect(back.text).toContain('Pay deposit');
		const office = await get(`/estimates/${est.h07.id}`, salesCookie);
		expect(office.text).toContain('Deposit cancelled, not paid');
		const second = await startPay(link);
		expect(second).not.toBe(first);
		await fakes.payments.pay(sessionIdOf(second));
		expect(await statusOf(est.h07.id)).toBe('accepted');
	});
});

describe('company details', () => {
	it('prints new details on proposals sent after the change; a sent one keeps its own', async () => {
		const bad = await post('/settings?/contact', ownerCookie, [
			['phone', '(555) 010-0199'],
			['email', 'not an address']
		]);
		expect(bad.status).toBe(400);
		expect(bad.text).toContain('Enter an address like office@example.com');
		expect((await get(`/estimates/${est.h02.id}/proposal`, salesCookie)).text).not.toContain(
			'(555) 010-0199'
		);
		const ok = await post('/settings?/contact', ownerCookie, [
			['phone', '(555) 010-0199'],
			['email', 'bookings@harborpine.example'],
			['postalAddress', '18 Ropewalk Lane, Wrenfield'],
			['licence', '']
		]);
		expect(ok.status).toBe(200);
		// h02 was sent before the change: its customer still reads the old number.
		const sent = await get(new URL(linkOf('h02')).pathname);
		expect(sent.text).toContain('(555) 010-0142');
		expect(sent.text).not.toContain('(555) 010-0199');
		const fresh = await readyEstimate(server.url, prep, 'h10');
		const preview = await get(`/estimates/${fresh.id}/proposal`, salesCookie);
		expect(preview.text).toContain('(555) 010-0199');
		expect(preview.text).toContain('bookings@harborpine.example');
	});
});

describe('the outbox retry loop', () => {
	it('starts with the server and sends what is due, so a refused e-mail is not lost', async () => {
		fakes.smtp.refuse('temporary');
		const r = await post(`/estimates/${est.h03.id}/proposal?/send`, salesCookie, [
			['to', 'h03.again@wrenfield.example'],
			['validUntil', IN_30]
		]);
		fakes.smtp.refuse(null);
		expect(r.status).toBe(200);
		expect(r.text).toContain('could not be delivered yet');
		// Make its next try due now, with the server stopped, then start it: nobody asks for a
		// retry, so only the loop started in `init` can send it.
		await server.stop();
		const db = openPglite(dir);
		await db.waitReady;
		const due = await db.query(
			`update mail_outbox set next_attempt_at = now() - interval '1 second'
			 where to_address = 'h03.again@wrenfield.example' and status = 'failed' returning id`
		);
		await db.close();
		expect(due.rows).toHaveLength(1);
		server = await startServer(dir, {
			...fakes.env,
			ADDRESS_HEADER: 'x-forwarded-for',
			XFF_DEPTH: '1'
		});
		const deadline = Date.now() + 20_000;
		while (
			!fakes.smtp.messages().some((m) => m.to.includes('h03.again@wrenfield.example')) &&
			Date.now() < deadline
		) {
			await new Promise((res) => setTimeout(res, 200));
		}
		expect(fakes.smtp.messages().flatMap((m) => m.to)).toContain('h03.again@wrenfield.example');
	});
});
