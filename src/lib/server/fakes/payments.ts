// A local stand-in for the payment service, for the demo and the tests only. It implements just
// what Clearpitch calls: create and retrieve a checkout session (honouring Idempotency-Key), and
// a hosted pay page whose Pay and Cancel buttons send signed webhook events to the app, then
// send the customer back to the session's success or cancel address. Listens on 127.0.0.1.
import { createHash, randomBytes } from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';

export type FakeSession = {
	id: string;
	object: 'checkout.session';
	mode: 'payment';
	status: 'open' | 'complete' | 'expired';
	payment_status: 'unpaid' | 'paid';
	amount_total: number;
	amount_subtotal: number;
	currency: string;
	client_reference_id: string | null;
	customer_email: string | null;
	metadata: Record<string, string>;
	success_url: string;
	cancel_url: string;
	url: string;
	created: number;
	expires_at: number;
	livemode: false;
	line_items_description: string;
};

export type FakeEvent = {
	id: string;
	object: 'event';
	type: string;
	created: number;
	api_version: string;
	livemode: false;
	pending_webhooks: number;
	data: { object: FakeSession };
};

export type Delivery = { eventId: string; status: number | null; error: string | null };

export type PaymentsFake = {
	/** http://127.0.0.1:PORT, for CLEARPITCH_PAYMENTS_FAKE_URL. */
	url: string;
	port: number;
	sessions(): FakeSession[];
	events(): FakeEvent[];
	deliveries(): Delivery[];
	/** What the Pay / Cancel buttons do, without a browser. Returns the event sent. */
	pay(sessionId: string): Promise<FakeEvent>;
	cancel(sessionId: string): Promise<FakeEvent>;
	/** Sends an event again, byte for byte, freshly signed (a replay or a retried delivery). */
	redeliver(eventId: string): Promise<Delivery>;
	setWebhookUrl(url: string): void;
	close(): Promise<void>;
};

const API_VERSION = Stripe.API_VERSION;

export async function startPaymentsFake(opts: {
	port?: number;
	webhookUrl: string;
	webhookSecret: string;
	/** The keys it accepts in Authorization: Bearer; any sk_test_… when omitted. */
	secretKey?: string;
}): Promise<PaymentsFake> {
	const host = '127.0.0.1';
	let webhookUrl = opts.webhookUrl;
	const sessions = new Map<string, FakeSession>();
	const events: FakeEvent[] = [];
	const deliveries: Delivery[] = [];
	const idempotency = new Map<string, { hash: string; sessionId: string }>();
	let base = '';

	const deliver = async (event: FakeEvent): Promise<Delivery> => {
		const payload = JSON.stringify(event, null, 2);
		const header = Stripe.webhooks.generateTestHeaderString({
			payload,
			secret: opts.webhookSecret
		});
		let d: Delivery = { eventId: event.id, status: null, error: null };
		// Delivered at least once: a failed delivery is tried twice more, shortly after.
		for (let attempt = 0; attempt < 3; attempt++) {
			try {
				const res = await fetch(webhookUrl, {
					method: 'POST',
					headers: { 'content-type': 'application/json', 'stripe-signature': header },
					body: payload,
					signal: AbortSignal.timeout(10_000)
				});
				await res.arrayBuffer();
				d = { eventId: event.id, status: res.status, error: null };
				if (res.ok) break;
			} catch (e) {
				d = { eventId: event.id, status: null, error: (e as Error).message };
			}
			await new Promise((r) => setTimeout(r, 200 * (attempt + 1)));
		}
		deliveries.push(d);
		return d;
	};

	const finish = async (id: string, how: 'pay' | 'cancel'): Promise<FakeEvent> => {
		const s = sessions.get(id);
		if (!s) throw new Error(`No such checkout session: ${id}`);
		if (s.status !== 'open') throw new Error(`Checkout session ${id} is already ${s.status}.`);
		if (how === 'pay') {
			s.status = 'complete';
			s.payment_status = 'paid';
		} else {
			// The real page's Cancel only goes back; the fake expires the session at once so the
			// demo and tests can show a cancelled payment without waiting a day.
			s.status = 'expired';
		}
		const event: FakeEvent = {
			id: `evt_${token(24)}`,
			object: 'event',
			type: how === 'pay' ? 'checkout.session.completed' : 'checkout.session.expired',
			created: Math.floor(Date.now() / 1000),
			api_version: API_VERSION,
			livemode: false,
			pending_webhooks: 1,
			data: { object: structuredClone(s) }
		};
		events.push(event);
		await deliver(event);
		return event;
	};

	const server = http.createServer((req, res) => {
		handle(req, res).catch((e) => {
			send(res, 500, { error: { type: 'api_error', message: (e as Error).message } });
		});
	});

	async function handle(req: http.IncomingMessage, res: http.ServerResponse) {
		const url = new URL(req.url ?? '/', base);
		const body = await readBody(req);

		if (url.pathname.startsWith('/v1/')) {
			const auth = req.headers.authorization ?? '';
			const key = auth.replace(/^Bearer\s+/i, '');
			const ok = opts.secretKey ? key === opts.secretKey : key.startsWith('sk_test_');
			if (!ok) {
				return send(res, 401, {
					error: { type: 'invalid_request_error', message: 'Invalid API key provided.' }
				});
			}
		}

		if (req.method === 'POST' && url.pathname === '/v1/checkout/sessions') {
			const key = header(req, 'idempotency-key');
			const hash = createHash('sha256').update(body).digest('hex');
			if (key && idempotency.has(key)) {
				const seen = idempotency.get(key)!;
				if (seen.hash !== hash) {
					return send(res, 400, {
						error: {
							type: 'idempotency_error',
							message:
								'Keys for idempotent requests can only be used with the same parameters they were first used with.'
						}
					});
				}
				return send(res, 200, sessions.get(seen.sessionId), { 'idempotent-replayed': 'true' });
			}
			const p = parseForm(body);
			const item = (p.line_items as Record<string, Record<string, unknown>> | undefined)?.['0'];
			const price = item?.price_data as Record<string, unknown> | undefined;
			const amount = Number(price?.unit_amount);
			const quantity = Number(item?.quantity ?? 1);
			const problems: string[] = [];
			if (p.mode !== 'payment') problems.push('mode must be payment');
			if (!price || !Number.isInteger(amount) || amount < 50)
				problems.push(
					'line_items[0][price_data][unit_amount] must be a whole number of cents ≥ 50'
				);
			if (!Number.isInteger(quantity) || quantity < 1) problems.push('quantity must be ≥ 1');
			if (typeof p.success_url !== 'string' || typeof p.cancel_url !== 'string')
				problems.push('success_url and cancel_url are required');
			if (problems.length) {
				return send(res, 400, {
					error: { type: 'invalid_request_error', message: problems.join('; ') }
				});
			}
			const id = `cs_test_${token(40)}`;
			const now = Math.floor(Date.now() / 1000);
			const productData = price!.product_data as Record<string, unknown> | undefined;
			const s: FakeSession = {
				id,
				object: 'checkout.session',
				mode: 'payment',
				status: 'open',
				payment_status: 'unpaid',
				amount_total: amount * quantity,
				amount_subtotal: amount * quantity,
				currency: String(price!.currency ?? 'usd'),
				client_reference_id: (p.client_reference_id as string) ?? null,
				customer_email: (p.customer_email as string) ?? null,
				metadata: (p.metadata as Record<string, string>) ?? {},
				success_url: p.success_url as string,
				cancel_url: p.cancel_url as string,
				url: `${base}/pay/${id}`,
				created: now,
				expires_at: now + 24 * 3600,
				livemode: false,
				line_items_description: String(productData?.name ?? 'Payment')
			};
			sessions.set(id, s);
			if (key) idempotency.set(key, { hash, sessionId: id });
			return send(res, 200, s);
		}

		const get = /^\/v1\/checkout\/sessions\/([A-Za-z0-9_]+)$/.exec(url.pathname);
		if (req.method === 'GET' && get) {
			const s = sessions.get(get[1]);
			if (!s) {
				return send(res, 404, {
					error: { type: 'invalid_request_error', message: `No such checkout.session: '${get[1]}'` }
				});
			}
			return send(res, 200, s);
		}

		const page = /^\/pay\/([A-Za-z0-9_]+)$/.exec(url.pathname);
		if (page) {
			const s = sessions.get(page[1]);
			if (!s) return html(res, 404, '<h1>No such payment</h1>');
			if (req.method === 'GET') return html(res, 200, payPage(s));
			if (req.method === 'POST') {
				const action = new URLSearchParams(body.toString()).get('action');
				if (s.status !== 'open') return html(res, 409, payPage(s));
				await finish(s.id, action === 'pay' ? 'pay' : 'cancel');
				const to =
					action === 'pay' ? s.success_url.replaceAll('{CHECKOUT_SESSION_ID}', s.id) : s.cancel_url;
				res.writeHead(303, { location: to });
				return res.end();
			}
		}
		send(res, 404, {
			error: {
				type: 'invalid_request_error',
				message: `Unrecognized request URL (${req.method}: ${url.pathname})`
			}
		});
	}

	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(opts.port ?? 0, host, () => resolve());
	});
	const port = (server.address() as AddressInfo).port;
	base = `http://${host}:${port}`;

	return {
		url: base,
		port,
		sessions: () => [...sessions.values()],
		events: () => [...events],
		deliveries: () => [...deliveries],
		pay: (id) => finish(id, 'pay'),
		cancel: (id) => finish(id, 'cancel'),
		redeliver: async (eventId) => {
			const e = events.find((x) => x.id === eventId);
			if (!e) throw new Error(`No such event: ${eventId}`);
			return deliver(e);
		},
		setWebhookUrl: (u) => {
			webhookUrl = u;
		},
		close: () =>
			new Promise<void>((resolve) => {
				server.closeAllConnections();
				server.close(() => resolve());
			})
	};
}

function payPage(s: FakeSession): string {
	const e = (v: string) =>
		v.replace(
			/[&<>"']/g,
			(c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!
		);
	const amount = `${(s.amount_total / 100).toFixed(2)} ${s.currency.toUpperCase()}`;
	const state =
		s.status === 'open'
			? `<form method="post"><button name="action" value="pay" type="submit">Pay ${e(amount)}</button>
<button name="action" value="cancel" type="submit" class="secondary">Cancel</button></form>`
			: `<p role="status">This payment is ${s.status === 'complete' ? 'paid' : 'cancelled'}.</p>`;
	return `<!doctype html><html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1"><title>Test payment</title>
<style>body{font-family:system-ui,sans-serif;max-width:28rem;margin:2rem auto;padding:0 1rem;color:#111}
.note{background:#fff7d6;border:1px solid #e5c100;padding:.5rem .75rem;border-radius:6px}
button{font-size:1rem;padding:.75rem 1.25rem;margin:.25rem .5rem .25rem 0;border-radius:6px;border:1px solid #1d4ed8;background:#1d4ed8;color:#fff;cursor:pointer}
button.secondary{background:#fff;color:#1d4ed8}</style></head><body>
<p class="note">Local test payment page: no card is asked for and no money moves.</p>
<h1>${e(s.line_items_description)}</h1>
<p>Amount: <strong>${e(amount)}</strong></p>
${state}
</body></html>`;
}

function send(
	res: http.ServerResponse,
	status: number,
	body: unknown,
	extra: Record<string, string> = {}
) {
	res.writeHead(status, {
		'content-type': 'application/json',
		'request-id': `req_${token(14)}`,
		...extra
	});
	res.end(JSON.stringify(body));
}

function html(res: http.ServerResponse, status: number, body: string) {
	res.writeHead(status, { 'content-type': 'text/html; charset=utf-8' });
	res.end(body);
}

function header(req: http.IncomingMessage, name: string): string | null {
	const v = req.headers[name];
	return Array.isArray(v) ? v[0] : (v ?? null);
}

async function readBody(req: http.IncomingMessage): Promise<Buffer> {
	const chunks: Buffer[] = [];
	let size = 0;
	for await (const c of req) {
		size += (c as Buffer).length;
		if (size > 1024 * 1024) throw new Error('Request body too large');
		chunks.push(c as Buffer);
	}
	return Buffer.concat(chunks);
}

/** Form bodies as the SDK encodes them: `a[b][0][c]=v` → { a: { b: { 0: { c: 'v' } } } }. */
export function parseForm(body: Buffer | string): Record<string, unknown> {
	const out: Record<string, unknown> = {};
	for (const [k, v] of new URLSearchParams(body.toString())) {
		const path = k.split(/[[\]]+/).filter(Boolean);
		if (
			path.some((part) => part === '__proto__' || part === 'constructor' || part === 'prototype')
		) {
			continue;
		}
		let node = out as Record<string, unknown>;
		path.forEach((part, i) => {
			if (i === path.length - 1) node[part] = v;
			else node = (node[part] ??= {}) as Record<string, unknown>;
		});
	}
	return out;
}

function token(n: number): string {
	const abc = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789';
	return [...randomBytes(n)].map((b) => abc[b % abc.length]).join('');
}
