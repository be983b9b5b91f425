import { sceneRequest, type Prepared } from '../integration/api-helpers';

/** A saved estimate of a scene house, moved to `ready` through the API (owner token). */
export async function readyEstimate(
	base: string,
	prep: Prepared,
	houseId: string
): Promise<{ id: string; totalCents: number; depositCents: number }> {
	const site = prep.sites.find((s) => s.houseId === houseId);
	if (!site) throw new Error(`No seeded site for ${houseId}`);
	const auth = { authorization: `Bearer ${prep.ownerToken}`, 'content-type': 'application/json' };
	const res = await fetch(`${base}/api/estimates`, {
		method: 'POST',
		headers: auth,
		body: JSON.stringify({ ...sceneRequest(houseId), siteId: site.id, save: true })
	});
	if (res.status !== 201) throw new Error(`estimate: ${res.status} ${await res.text()}`);
	const body = (await res.json()) as {
		estimate: { id: string };
		price: { totalCents: number; depositCents: number };
	};
	const patch = await fetch(`${base}/api/estimates/${body.estimate.id}`, {
		method: 'PATCH',
		headers: { ...auth, origin: base },
		body: JSON.stringify({ status: 'ready' })
	});
	if (patch.status !== 200) throw new Error(`ready: ${patch.status} ${await patch.text()}`);
	return {
		id: body.estimate.id,
		totalCents: body.price.totalCents,
		depositCents: body.price.depositCents
	};
}

/** The private link in a proposal e-mail's text part. */
export function linkIn(text: string | null): string {
	const m = /https?:\/\/[^\s/]+\/p\/[A-Za-z0-9_-]{43}/.exec(text ?? '');
	if (!m) throw new Error(`No proposal link in:\n${text}`);
	return m[0];
}

async function formPost(base: string, path: string, cookie: string | null, fields: string[][]) {
	const res = await fetch(base + path, {
		method: 'POST',
		redirect: 'manual',
		headers: {
			'content-type': 'application/x-www-form-urlencoded',
			origin: base,
			...(cookie ? { cookie } : {})
		},
		body: new URLSearchParams(fields).toString()
	});
	return { status: res.status, text: await res.text() };
}

/**
 * A scene house's estimate taken the customer's way over HTTP: ready, its proposal sent by
 * sales, accepted with no extra, and the deposit paid on the payment fake (whose signed webhook
 * moves it to accepted). Answers the estimate and the deposit charged, in cents.
 */
export async function depositPaidEstimate(
	base: string,
	prep: Prepared,
	houseId: string,
	salesCookie: string,
	fakes: {
		smtp: { messages(): { to: string[]; text: string | null }[] };
		payments: {
			pay(id: string): Promise<unknown>;
			sessions(): { id: string; amount_total: number }[];
		};
	}
): Promise<{ id: string; depositCents: number }> {
	const ready = await readyEstimate(base, prep, houseId);
	const to = `${houseId}.deposit@wrenfield.example`;
	const validUntil = new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10);
	const sent = await formPost(base, `/estimates/${ready.id}/proposal?/send`, salesCookie, [
		['to', to],
		['validUntil', validUntil]
	]);
	if (sent.status !== 200) throw new Error(`send: ${sent.status}`);
	const path = new URL(linkIn(fakes.smtp.messages().find((m) => m.to.includes(to))?.text ?? null))
		.pathname;
	const accepted = await formPost(base, `${path}?/accept`, null, [
		['fullName', 'Marisol Quenby'],
		['consent', 'yes']
	]);
	if (accepted.status !== 200) throw new Error(`accept: ${accepted.status}`);
	const pay = await formPost(base, `${path}?/pay`, null, []);
	const session = /\/pay\/(cs_[A-Za-z0-9_]+)/.exec(pay.text)?.[1];
	if (!session) throw new Error(`No deposit checkout: ${pay.text.slice(0, 200)}`);
	await fakes.payments.pay(session);
	const depositCents = fakes.payments.sessions().find((s) => s.id === session)!.amount_total;
	return { id: ready.id, depositCents };
}
