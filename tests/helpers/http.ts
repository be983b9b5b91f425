import sharp from 'sharp';
import { DEMO, DEMO_PASSWORD } from './server';

/** Signs in over plain HTTP the way a browser form would, and returns the session cookie. */
export async function signIn(
	base: string,
	email: string,
	password = DEMO_PASSWORD,
	headers: Record<string, string> = {}
): Promise<{ status: number; cookie: string | null; location: string | null; body: string }> {
	const res = await fetch(`${base}/sign-in`, {
		method: 'POST',
		redirect: 'manual',
		headers: {
			'content-type': 'application/x-www-form-urlencoded',
			accept: 'text/html',
			origin: base,
			...headers
		},
		body: new URLSearchParams({ email, password })
	});
	const set = res.headers.getSetCookie().find((c) => c.startsWith('cp_session='));
	const cookie = set ? set.split(';')[0] : null;
	return {
		status: res.status,
		cookie: cookie && cookie !== 'cp_session=' ? cookie : null,
		location: res.headers.get('location'),
		body: await res.text()
	};
}

export async function sessionFor(base: string, role: keyof typeof DEMO): Promise<string> {
	const r = await signIn(base, DEMO[role]);
	if (!r.cookie) throw new Error(`Sign-in as ${role} failed with ${r.status}`);
	return r.cookie;
}

/**
 * Creates something through the JSON API with a bearer token, for a test's setup: anything but a
 * 201 throws with the server's answer, so a broken setup fails loudly rather than a later check.
 */
export async function createWithToken<T>(
	base: string,
	token: string,
	path: string,
	body: unknown
): Promise<T> {
	const res = await fetch(base + path, {
		method: 'POST',
		headers: {
			authorization: `Bearer ${token}`,
			'content-type': 'application/json',
			accept: 'application/json'
		},
		body: JSON.stringify(body)
	});
	if (res.status !== 201) throw new Error(`${path}: ${res.status} ${await res.text()}`);
	return (await res.json()) as T;
}

/** Uploads a small generated JPEG to an estimate's started site visit, for a test's setup. */
export async function uploadPhoto(
	base: string,
	token: string,
	estimateId: string,
	name: string
): Promise<{ photo: { id: string } }> {
	const bytes = await sharp({
		create: { width: 64, height: 48, channels: 3, background: '#5a6b4d' }
	})
		.jpeg()
		.toBuffer();
	const res = await fetch(`${base}/api/estimates/${estimateId}/photos`, {
		method: 'POST',
		headers: {
			authorization: `Bearer ${token}`,
			'content-type': 'application/octet-stream',
			'x-photo-name': encodeURIComponent(name)
		},
		body: bytes as Uint8Array<ArrayBuffer>
	});
	if (res.status !== 201) throw new Error(`photo upload: ${res.status} ${await res.text()}`);
	return (await res.json()) as { photo: { id: string } };
}
