// The end of a job's money over HTTP, against the built server with the local SMTP and payment
// fakes: a job closed by the crew issues its final invoice (the accepted price and extra, less
// the deposit paid) with an e-mailed pay link; the customer pays it on the payment service's
// page and the signed webhook moves the job and its estimate to paid, once, whatever is
// replayed or tampered with; the owner records cash or a cheque instead; after photos take the
// site-visit upload path and count towards marking a job done.
import { openPglite } from '../helpers/pglite';
import * as devalue from 'devalue';
import sharp from 'sharp';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { localToday } from '../../src/lib/jobs/week';
import { startTestFakes, TEST_WEBHOOK_SECRET, type TestFakes } from '../helpers/fakes';
import { sessionFor } from '../helpers/http';
import { acceptedEstimate, crewIds, getJob, postAction, scheduleViaForm } from '../helpers/jobs';
import { linkIn, readyEstimate } from '../helpers/proposal';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { prepareDataDir, type Prepared } from './api-helpers';

let server: TestServer;
let fakes: TestFakes;
let prep: Prepared;
let dir: string;
const cookies: Record<string, string> = {};
const IN_30 = new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10);

/** The accepted, deposit-paid, scheduled job of h01 and what the customer agreed to. */
const card = { estimateId: '', jobId: '', acceptedCents: 0, depositCents: 0 };
/** A second job, closed and settled by a cheque the owner records. */
const cheque = { estimateId: '', jobId: '' };

async function form(path: string, cookie: string | null, fields: [string, string][]) {
	const res = await fetch(server.url + path, {
		method: 'POST',
		redirect: 'manual',
		headers: {
			'content-type': 'application/x-www-form-urlencoded',
			accept: 'text/html',
			origin: server.url,
			...(cookie ? { cookie } : {})
		},
		body: new URLSearchParams(fields).toString()
	});
	return { status: res.status, text: await res.text() };
}

async function api<T>(path: string, init: RequestInit = {}): Promise<{ status: number; body: T }> {
	const res = await fetch(server.url + path, {
		...init,
		headers: { authorization: `Bearer ${prep.ownerToken}`, ...(init.headers ?? {}) }
	});
	return { status: res.status, body: (await res.json()) as T };
}

const statusOf = async (id: string) =>
	(await api<{ status: string }>(`/api/estimates/${id}`)).body.status;

async function closeJob(jobId: string, cookie: string) {
	const r = await postAction(server.url, cookie, `/crew/${jobId}?/done`, {
		reason: 'After photos sent to the office by text'
	});
	if (r.type !== 'success') throw new Error(`done: ${r.status} ${r.data}`);
}

/** Rows of a table, counted with the server stopped (one process opens PGlite at a time). */
async function countRows(sql: string): Promise<number> {
	await server.stop();
	const db = openPglite(dir);
	try {
		await db.waitReady;
		return (await db.query<{ n: number }>(sql)).rows[0].n;
	} finally {
		await db.close();
		server = await startServer(dir, fakes.env);
		fakes.payments.setWebhookUrl(`${server.url}/api/payments/webhook`);
		for (const role of ['owner', 'estimator', 'sales', 'crew'] as const) {
			cookies[role] = await sessionFor(server.url, role);
		}
	}
}

function invoiceMail(to: string) {
	const m = fakes.smtp
		.messages()
		.find((x) => x.to.includes(to) && /Invoice \d+/.test(x.subject ?? ''));
	if (!m) throw new Error(`No invoice e-mail to ${to}`);
	return m;
}

/** The customer's invoice page data, as the browser loads it. */
async function invoiceData(link: string): Promise<{ balance: Balance; owedCents: number }> {
	const res = await fetch(`${link}/__data.json`);
	expect(res.status).toBe(200);
	const body = (await res.json()) as { nodes: ({ data: unknown[] } | null)[] };
	const node = body.nodes.filter(Boolean).at(-1)!;
	return (devalue.unflatten(node.data) as { invoice: { balance: Balance; owedCents: number } })
		.invoice;
}

const invoiceLink = (text: string | null) => {
	const m = /https?:\/\/[^\s/]+\/i\/[A-Za-z0-9_-]{43}/.exec(text ?? '');
	if (!m) throw new Error(`No invoice link in:\n${text}`);
	return m[0];
};

beforeAll(async () => {
	dir = seededDataDir('balance');
	prep = await prepareDataDir(dir);
	fakes = await startTestFakes();
	server = await startServer(dir, fakes.env);
	fakes.payments.setWebhookUrl(`${server.url}/api/payments/webhook`);
	for (const role of ['owner', 'estimator', 'sales', 'crew'] as const) {
		cookies[role] = await sessionFor(server.url, role);
	}
	const crew = await crewIds(server.url, prep.ownerToken);

	// h01: sent, accepted with its first extra, deposit paid on the fake, scheduled for the crew.
	const ready = await readyEstimate(server.url, prep, 'h01');
	card.estimateId = ready.id;
	const sent = await form(`/estimates/${ready.id}/proposal?/send`, cookies.sales, [
		['to', 'h01@wrenfield.example'],
		['validUntil', IN_30]
	]);
	expect(sent.status).toBe(200);
	const link = linkIn(
		fakes.smtp.messages().find((m) => m.to.includes('h01@wrenfield.example'))?.text ?? null
	);
	const page = await fetch(link).then((r) => r.text());
	const code = /name="extras" value="([a-z0-9_-]+)"/.exec(page)?.[1];
	if (!code) throw new Error('The proposal offers no extra.');
	const path = new URL(link).pathname;
	const accepted = await form(`${path}?/accept`, null, [
		['fullName', 'Marisol Quenby'],
		['consent', 'yes'],
		['extras', code]
	]);
	expect(accepted.status).toBe(200);
	const pay = await form(`${path}?/pay`, null, []);
	const session = /\/pay\/(cs_[A-Za-z0-9_]+)/.exec(pay.text)?.[1];
	if (!session) throw new Error(`No deposit checkout: ${pay.text.slice(0, 200)}`);
	await fakes.payments.pay(session);
	expect(await statusOf(card.estimateId)).toBe('accepted');
	const s = fakes.payments.sessions().find((x) => x.id === session)!;
	card.depositCents = s.amount_total;
	const answered = await fetch(`${link}/__data.json`).then(
		(r) => r.json() as Promise<{ nodes: ({ data: unknown[] } | null)[] }>
	);
	const answer = (
		devalue.unflatten(answered.nodes.filter(Boolean).at(-1)!.data) as {
			proposal: { answer: { totalCents: number; depositCents: number } };
		}
	).proposal.answer;
	card.acceptedCents = answer.totalCents;
	expect(answer.depositCents).toBe(card.depositCents);
	card.jobId = await scheduleViaForm(server.url, cookies.owner, {
		estimateId: card.estimateId,
		date: localToday(),
		crewIds: [crew[DEMO.crew]]
	});

	// h02: accepted by the office without a proposal (no deposit), scheduled.
	const site = prep.sites.find((x) => x.houseId === 'h02')!;
	cheque.estimateId = await acceptedEstimate(server.url, prep.ownerToken, site);
	cheque.jobId = await scheduleViaForm(server.url, cookies.owner, {
		estimateId: cheque.estimateId,
		date: localToday(),
		crewIds: [crew[DEMO.crew]]
	});
}, 300_000);

afterAll(async () => {
	await server?.stop();
	await fakes?.stop();
});

type Balance = {
	number: number;
	lines: { label: string; amountCents: number }[];
	subtotalCents: number;
	taxCents: number;
	totalCents: number;
};

describe('the final invoice', () => {
	it('has no invoice before the job is done, so the owner cannot record a payment', async () => {
		const r = await form(`/estimates/${cheque.estimateId}?/payment`, cookies.owner, [
			['method', 'cash'],
			['reference', '']
		]);
		expect(r.status).toBe(409);
		expect(r.text).toContain('There is no final invoice yet');
	});

	it('is issued when the crew marks the job done, for the accepted price less the deposit', async () => {
		await closeJob(card.jobId, cookies.crew);
		expect(await statusOf(card.estimateId)).toBe('done');
		const mail = invoiceMail('h01@wrenfield.example');
		expect(mail.html).toContain(invoiceLink(mail.text));
		// Read the invoice as the customer sees it: the page's data carries the issued figures.
		const total = (await invoiceData(invoiceLink(mail.text))).balance.totalCents;
		// Plain arithmetic on what was accepted: total owed = accepted total − deposit paid.
		expect(total).toBe(card.acceptedCents - card.depositCents);
		expect(mail.subject).toMatch(/^Invoice \d+ — /);
	});

	it('numbers it next in the series, once: a second done changes nothing', async () => {
		const again = await postAction(server.url, cookies.crew, `/crew/${card.jobId}?/done`, {
			reason: 'After photos sent to the office by text'
		});
		expect(again.status).toBe(409);
		expect(
			await countRows(
				`select count(*)::int as n from invoices i join invoice_links l on l.invoice_id = i.id
				 where i.estimate_id = '${card.estimateId}'`
			)
		).toBe(1);
		// The test seed has no invoices: this is the company's first.
		const n = await countRows(`select max(number)::int as n from invoices`);
		expect(n).toBe(1);
	});

	it('adds up: lines + tax = total, and the deposit is a line taken off', async () => {
		await server.stop();
		const pg = openPglite(dir);
		let inv: Balance;
		try {
			await pg.waitReady;
			const r = await pg.query<{
				number: number;
				lines: Balance['lines'];
				subtotal_cents: number;
				tax_cents: number;
				total_cents: number;
			}>(`select * from invoices where estimate_id = $1`, [card.estimateId]);
			const row = r.rows[0];
			inv = {
				number: row.number,
				lines: row.lines,
				subtotalCents: row.subtotal_cents,
				taxCents: row.tax_cents,
				totalCents: row.total_cents
			};
		} finally {
			await pg.close();
			server = await startServer(dir, fakes.env);
			fakes.payments.setWebhookUrl(`${server.url}/api/payments/webhook`);
			for (const role of ['owner', 'estimator', 'sales', 'crew'] as const) {
				cookies[role] = await sessionFor(server.url, role);
			}
		}
		expect(inv.lines.reduce((s, l) => s + l.amountCents, 0)).toBe(inv.subtotalCents);
		expect(inv.subtotalCents + inv.taxCents).toBe(inv.totalCents);
		expect(inv.lines.at(-1)).toEqual({
			label: 'Less deposit paid',
			amountCents: -card.depositCents
		});
		expect(inv.lines.some((l) => l.label.startsWith('Extra: '))).toBe(true);
	});
});

describe('paying the balance', () => {
	let link = '';
	let session = '';

	it('refuses a link that is not one of ours with 404', async () => {
		expect((await fetch(`${server.url}/i/${'A'.repeat(43)}`)).status).toBe(404);
		expect((await fetch(`${server.url}/i/short`)).status).toBe(404);
	});

	it('charges what the invoice owes, one session for a double click', async () => {
		// The server restarted since the e-mail was written: the same path on its new port.
		link = server.url + new URL(invoiceLink(invoiceMail('h01@wrenfield.example').text)).pathname;
		const path = new URL(link).pathname;
		const [a, b] = await Promise.all([
			form(`${path}?/pay`, null, [['amountCents', '1']]),
			form(`${path}?/pay`, null, [])
		]);
		const ids = [a, b].map((r) => /\/pay\/(cs_[A-Za-z0-9_]+)/.exec(r.text)?.[1]);
		expect(ids[0]).toBeTruthy();
		expect(new Set(ids).size).toBe(1);
		session = ids[0]!;
		const s = fakes.payments.sessions().find((x) => x.id === session)!;
		const owed = (await invoiceData(link)).owedCents;
		// The amount never comes from the browser: the body's amountCents was ignored.
		expect(s.amount_total).toBe(owed);
		expect(s.metadata.kind).toBe('balance');
	});

	it('ignores a tampered event: 400, and the job stays done', async () => {
		const s = fakes.payments.sessions().find((x) => x.id === session)!;
		const forged = { ...s, status: 'complete', payment_status: 'paid' };
		const payload = JSON.stringify({
			id: 'evt_forged_balance',
			object: 'event',
			type: 'checkout.session.completed',
			created: Math.floor(Date.now() / 1000),
			data: { object: forged }
		});
		const header = Stripe.webhooks.generateTestHeaderString({ payload, secret: 'whsec_other' });
		const r = await fetch(`${server.url}/api/payments/webhook`, {
			method: 'POST',
			headers: { 'content-type': 'application/json', 'stripe-signature': header },
			body: payload
		});
		expect(r.status).toBe(400);
		expect(await statusOf(card.estimateId)).toBe('done');
	});

	it('is paid once the signed webhook arrives; a replay changes nothing', async () => {
		const event = await fakes.payments.pay(session);
		expect(fakes.payments.deliveries().find((d) => d.eventId === event.id)?.status).toBe(200);
		expect(await statusOf(card.estimateId)).toBe('paid');
		expect((await getJob(server.url, prep.ownerToken, card.jobId)).status).toBe('paid');
		const replay = await fakes.payments.redeliver(event.id);
		expect(replay.status).toBe(200);
		const payload = JSON.stringify(event);
		const again = await fetch(`${server.url}/api/payments/webhook`, {
			method: 'POST',
			headers: {
				'content-type': 'application/json',
				'stripe-signature': Stripe.webhooks.generateTestHeaderString({
					payload,
					secret: TEST_WEBHOOK_SECRET
				})
			},
			body: payload
		});
		expect(((await again.json()) as { outcome: string }).outcome).toBe('duplicate');
		const page = await fetch(link).then((r) => r.text());
		expect(page).toContain('data-testid="invoice-paid"');
		expect(
			await countRows(
				`select count(*)::int as n from invoice_payments p join invoices i on i.id = p.invoice_id
				 where i.estimate_id = '${card.estimateId}'`
			)
		).toBe(1);
	});

	it('refuses to start a second payment of a paid invoice', async () => {
		const r = await form(`${new URL(link).pathname}?/pay`, null, []);
		expect(r.status).toBe(409);
		expect(r.text).toContain('already paid');
	});
});

describe('cash or a cheque, recorded by the owner', () => {
	it('refuses other roles, a bad method and an overlong reference, changing nothing', async () => {
		await closeJob(cheque.jobId, cookies.owner);
		expect(await statusOf(cheque.estimateId)).toBe('done');
		for (const role of ['estimator', 'sales'] as const) {
			const r = await form(`/estimates/${cheque.estimateId}?/payment`, cookies[role], [
				['method', 'cash']
			]);
			expect(r.status, role).toBe(403);
		}
		const crew = await form(`/estimates/${cheque.estimateId}?/payment`, cookies.crew, [
			['method', 'cash']
		]);
		expect([403, 303]).toContain(crew.status);
		const bad = await form(`/estimates/${cheque.estimateId}?/payment`, cookies.owner, [
			['method', 'bitcoin']
		]);
		expect(bad.status).toBe(400);
		expect(bad.text).toContain('Pick cash or cheque.');
		const long = await form(`/estimates/${cheque.estimateId}?/payment`, cookies.owner, [
			['method', 'cheque'],
			['reference', 'x'.repeat(81)]
		]);
		expect(long.status).toBe(400);
		expect(long.text).toContain('Keep the reference to 80 characters.');
		expect(await statusOf(cheque.estimateId)).toBe('done');
	});

	it('corrects the sent invoice with a credit note, refusing bad input and changing nothing', async () => {
		const credit = (cookie: string, fields: [string, string][]) =>
			form(`/estimates/${cheque.estimateId}?/credit`, cookie, fields);
		const before = await api<{ totalCents: number }>(`/api/estimates/${cheque.estimateId}`);
		expect(before.status).toBe(200);
		expect(
			(
				await credit(cookies.sales, [
					['amount', '25'],
					['reason', 'Porch left']
				])
			).status
		).toBe(403);
		const cases: [string, string, string][] = [
			['abc', 'Porch roof left', 'Enter an amount in dollars and cents'],
			['0', 'Porch roof left', 'A credit must be more than $0.00.'],
			['12.345', 'Porch roof left', 'Enter an amount in dollars and cents'],
			['25', 'ok', 'Say what the credit is for (at least 3 characters).'],
			['25', 'x'.repeat(121), 'Keep the reason to 120 characters.']
		];
		for (const [amount, reason, message] of cases) {
			const r = await credit(cookies.owner, [
				['amount', amount],
				['reason', reason]
			]);
			expect(r.status, amount).toBe(400);
			expect(r.text).toContain(message);
		}
		const tooMuch = await credit(cookies.owner, [
			['amount', '1000000'],
			['reason', 'Everything']
		]);
		expect(tooMuch.status).toBe(409);
		expect(tooMuch.text).toContain('more than the');
		expect(
			await countRows(`select count(*)::int as n from invoices where kind = 'credit_note'`)
		).toBe(0);

		const ok = await credit(cookies.owner, [
			['amount', '$25.00'],
			['reason', 'Rear porch roof left for the next visit']
		]);
		expect(ok.status).toBe(200);
		const page = await fetch(`${server.url}/estimates/${cheque.estimateId}`, {
			headers: { cookie: cookies.owner }
		}).then((x) => x.text());
		expect(page).toContain('Rear porch roof left for the next visit');
		expect(page).toMatch(/Credit note <span class="tabular">3<\/span>/);
		// The invoice itself is as it was; the credit note is its own row, stored negative.
		expect(
			await countRows(
				`select count(*)::int as n from invoices where kind = 'credit_note' and total_cents = -2500`
			)
		).toBe(1);
		expect(
			await countRows(
				`select count(*)::int as n from audit_log where action = 'credit-note' and summary like '%$25.00%'`
			)
		).toBe(1);
	});

	it('settles the invoice for what it owes, once', async () => {
		const r = await form(`/estimates/${cheque.estimateId}?/payment`, cookies.owner, [
			['method', 'cheque'],
			['reference', 'Cheque 2291']
		]);
		expect(r.status).toBe(200);
		expect(await statusOf(cheque.estimateId)).toBe('paid');
		expect((await getJob(server.url, prep.ownerToken, cheque.jobId)).status).toBe('paid');
		const page = await fetch(`${server.url}/estimates/${cheque.estimateId}`, {
			headers: { cookie: cookies.owner }
		}).then((x) => x.text());
		expect(page).toContain('Paid by cheque');
		expect(page).toContain('Cheque 2291');
		const twice = await form(`/estimates/${cheque.estimateId}?/payment`, cookies.owner, [
			['method', 'cash']
		]);
		expect(twice.status).toBe(409);
		expect(twice.text).toContain('already paid');
		// Settled for what the credit note left owing.
		expect(
			await countRows(
				`select (i.total_cents - p.amount_cents)::int as n from invoice_payments p
				   join invoices i on i.id = p.invoice_id where i.estimate_id = '${cheque.estimateId}'`
			)
		).toBe(2500);
		// Numbered with no gap: the card invoice 1, this one 2, its credit note 3.
		expect(await countRows(`select max(number)::int as n from invoices`)).toBe(3);
	});

	it('refuses a bare status move to paid: it is the payment that pays', async () => {
		const done = await acceptedEstimate(
			server.url,
			prep.ownerToken,
			prep.sites.find((x) => x.houseId === 'h03')!
		);
		const r = await api<{ message: string }>(`/api/estimates/${done}`, {
			method: 'PATCH',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ status: 'paid' })
		});
		expect(r.status).toBe(409);
	});
});

describe('after photos', () => {
	const jpeg = () =>
		sharp({ create: { width: 64, height: 48, channels: 3, background: '#6b7d5a' } })
			.jpeg()
			.toBuffer();
	const upload = (jobId: string, cookie: string, body: Buffer, name = 'after.jpg') =>
		fetch(`${server.url}/api/jobs/${jobId}/photos`, {
			method: 'POST',
			headers: {
				cookie,
				origin: server.url,
				'content-type': 'application/octet-stream',
				'x-photo-name': encodeURIComponent(name)
			},
			body: body as Uint8Array<ArrayBuffer>
		});

	it('take the crew’s photo for a job they are on, and it counts for marking done', async () => {
		const site = prep.sites.find((x) => x.houseId === 'h04')!;
		const est = await acceptedEstimate(server.url, prep.ownerToken, site);
		const crew = await crewIds(server.url, prep.ownerToken);
		const jobId = await scheduleViaForm(server.url, cookies.owner, {
			estimateId: est,
			date: localToday(),
			crewIds: [crew[DEMO.crew]]
		});
		const r = await upload(jobId, cookies.crew, await jpeg());
		expect(r.status).toBe(201);
		const list = await fetch(`${server.url}/api/jobs/${jobId}/photos`, {
			headers: { cookie: cookies.crew }
		}).then((x) => x.json() as Promise<{ photos: { id: string }[] }>);
		expect(list.photos).toHaveLength(1);
		const sheet = await fetch(`${server.url}/crew/${jobId}`, {
			headers: { cookie: cookies.crew }
		}).then((x) => x.text());
		expect(sheet).toContain('(1 so far)');
		// Sales are not on jobs: after photos are the crew's and the owner's.
		expect((await upload(jobId, cookies.sales, await jpeg())).status).toBe(403);
	});

	it('refuse a file that is not an image, naming it, and store nothing', async () => {
		const r = await upload(card.jobId, cookies.owner, Buffer.from('not a photo at all'), 'x.jpg');
		expect(r.status).toBe(409); // the paid job is closed before the bytes are read
		const site = prep.sites.find((x) => x.houseId === 'h05')!;
		const est = await acceptedEstimate(server.url, prep.ownerToken, site);
		const crew = await crewIds(server.url, prep.ownerToken);
		const jobId = await scheduleViaForm(server.url, cookies.owner, {
			estimateId: est,
			date: localToday(),
			crewIds: [crew[DEMO.crew]]
		});
		const bad = await upload(jobId, cookies.crew, Buffer.from('not a photo at all'), 'roof.jpg');
		expect(bad.status).toBe(415);
		expect(((await bad.json()) as { message: string }).message).toContain('roof.jpg');
		expect(await countRows(`select count(*)::int as n from photos where job_id = '${jobId}'`)).toBe(
			0
		);
	});
});
