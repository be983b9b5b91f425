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
