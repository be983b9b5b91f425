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
