// Sign-in, sessions and roles against the built server over HTTP, on a fresh seeded PGlite.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn, sessionFor } from '../helpers/http';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';

let server: TestServer;

beforeAll(async () => {
	server = await startServer(seededDataDir('auth'));
});
afterAll(async () => server?.stop());

const get = (path: string, cookie?: string, headers: Record<string, string> = {}) =>
	fetch(server.url + path, {
		redirect: 'manual',
		headers: { ...(cookie ? { cookie } : {}), accept: 'text/html', ...headers }
	});

describe('sign-in', () => {
	it('signs each demo role in with a hardened session cookie', async () => {
		for (const email of Object.values(DEMO)) {
			const r = await signIn(server.url, email);
			expect(r.status).toBe(303);
			expect(r.cookie).toMatch(/^cp_session=.{20,}/);
		}
		const res = await fetch(`${server.url}/sign-in`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				'content-type': 'application/x-www-form-urlencoded',
				accept: 'text/html',
				origin: server.url
			},
			body: new URLSearchParams({ email: DEMO.sales, password: 'pitch-demo-2026' })
		});
		const set = res.headers.getSetCookie().join('\n');
		// The database keeps only a hash of the cookie's token.
		const token = set.match(/cp_session=([^;]+)/)![1];
		expect(token.length).toBeGreaterThanOrEqual(26);
		// Lucia's session-cookie guidance (lucia-auth.com/sessions/cookies): HttpOnly, SameSite=Lax,
		// Secure, Path=/.
		expect(set).toMatch(/HttpOnly/);
		expect(set).toMatch(/SameSite=Lax/);
		expect(set).toMatch(/Secure/);
		expect(set).toMatch(/Path=\//);
	});

	it('answers an unknown user exactly as a wrong password, and starts no session', async () => {
		const wrong = await signIn(server.url, DEMO.estimator, 'not-the-password', {
			'x-test-client': 'a'
		});
		const unknown = await signIn(server.url, 'nobody@harborpine.example', 'not-the-password');
		expect(wrong.status).toBe(400);
		expect(unknown.status).toBe(400);
		expect(wrong.cookie).toBeNull();
		expect(unknown.cookie).toBeNull();
		const msg = (b: string) => b.match(/role="alert"[^>]*>([^<]*)/)?.[1].trim();
		expect(msg(wrong.body)).toBe('That e-mail and password do not match an active account.');
		expect(msg(unknown.body)).toBe(msg(wrong.body));
	});

	it('gives 429 to the sixth rapid wrong sign-in from one client', async () => {
		const codes: number[] = [];
		for (let i = 0; i < 6; i++) {
			codes.push((await signIn(server.url, 'rate-probe@harborpine.example', `wrong-${i}`)).status);
		}
		expect(codes).toEqual([400, 400, 400, 400, 400, 429]);
	});

	it('refuses a cross-origin form POST', async () => {
		const r = await signIn(server.url, DEMO.owner, 'pitch-demo-2026', {
			origin: 'https://evil.example'
		});
		expect(r.status).toBe(403);
		expect(r.cookie).toBeNull();
	});
});

describe('roles', () => {
	it('sends a signed-out visitor to sign-in and the API answers 401', async () => {
		const page = await get('/sites');
		expect(page.status).toBe(303);
		expect(page.headers.get('location')).toBe('/sign-in?next=%2Fsites');
		const api = await get('/api/team', undefined, { accept: 'application/json' });
		expect(api.status).toBe(401);
		expect((await api.json()).message).toMatch(/Sign in/);
	});

	it('refuses the Team page and its API to crew, estimator and sales', async () => {
		for (const role of ['crew', 'estimator', 'sales'] as const) {
			const cookie = await sessionFor(server.url, role);
			expect((await get('/team', cookie)).status).toBe(403);
			const api = await get('/api/team', cookie, { accept: 'application/json' });
			expect(api.status).toBe(403);
			expect((await api.json()).message).toMatch(/role/);
		}
		const owner = await sessionFor(server.url, 'owner');
		expect((await get('/team', owner)).status).toBe(200);
		const api = await get('/api/team', owner, { accept: 'application/json' });
		expect(api.status).toBe(200);
		const body = await api.json();
		expect(body.members).toHaveLength(4);
		expect(JSON.stringify(body)).not.toMatch(/argon2|passwordHash/);
	});

	it('keeps crew out of office pages but lets them read crew sheets', async () => {
		const crew = await sessionFor(server.url, 'crew');
		expect((await get('/sites', crew)).status).toBe(403);
		expect((await get('/rates', crew)).status).toBe(403);
		expect((await get('/crew', crew)).status).toBe(200);
	});
});

describe('session lifecycle', () => {
	async function post(path: string, cookie: string, form: Record<string, string>) {
		return fetch(server.url + path, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				cookie,
				origin: server.url,
				accept: 'text/html',
				'content-type': 'application/x-www-form-urlencoded'
			},
			body: new URLSearchParams(form)
		});
	}

	it('invites a member, ends their sessions on deactivation and refuses bad input', async () => {
		const owner = await sessionFor(server.url, 'owner');
		const bad = await post('/team?/invite', owner, {
			name: '',
			email: 'not-an-email',
			role: 'janitor',
			password: 'short'
		});
		expect(bad.status).toBe(400);
		const html = await bad.text();
		expect(html).toContain('Enter a valid e-mail address.');
		expect(html).toContain('Use at least 12 characters.');

		const ok = await post('/team?/invite', owner, {
			name: 'Wendell Ashgrove',
			email: 'wendell@harborpine.example',
			role: 'sales',
			password: 'a-long-first-password'
		});
		expect(ok.status).toBe(200);
		const dup = await post('/team?/invite', owner, {
			name: 'Someone Else',
			email: 'wendell@harborpine.example',
			role: 'crew',
			password: 'a-long-first-password'
		});
		expect(dup.status).toBe(400);

		const wendell = await signIn(server.url, 'wendell@harborpine.example', 'a-long-first-password');
		expect(wendell.cookie).not.toBeNull();
		expect((await get('/sites', wendell.cookie!)).status).toBe(200);

		const team = await (await get('/api/team', owner, { accept: 'application/json' })).json();
		const id = team.members.find((m: { email: string }) => m.email.startsWith('wendell')).id;
		expect((await post('/team?/deactivate', owner, { userId: id })).status).toBe(200);

		// The old session is dead at once, and signing in again is refused.
		expect((await get('/sites', wendell.cookie!)).status).toBe(303);
		const again = await signIn(server.url, 'wendell@harborpine.example', 'a-long-first-password');
		expect(again.status).toBe(400);
	});

	it('ends the other sessions when a user changes their password', async () => {
		const a = await sessionFor(server.url, 'estimator');
		const b = await sessionFor(server.url, 'estimator');
		const res = await post('/account?/password', a, {
			current: 'pitch-demo-2026',
			next: 'a-brand-new-password',
			confirm: 'a-brand-new-password'
		});
		expect(res.status).toBe(200);
		expect((await get('/sites', a)).status).toBe(200);
		expect((await get('/sites', b)).status).toBe(303);
		const wrongCurrent = await post('/account?/password', a, {
			current: 'wrong',
			next: 'another-new-password',
			confirm: 'another-new-password'
		});
		expect(wrongCurrent.status).toBe(400);
	});

	it('signs out: the cookie is cleared and the old session no longer works', async () => {
		const s = await sessionFor(server.url, 'sales');
		const out = await post('/sign-out', s, {});
		expect(out.status).toBe(303);
		expect((await get('/sites', s)).status).toBe(303);
	});
});

describe('rate limit before hashing', () => {
	it('refuses even the right password while a client is limited', async () => {
		for (let i = 0; i < 5; i++) await signIn(server.url, DEMO.sales, `wrong-${i}`);
		const r = await signIn(server.url, DEMO.sales);
		expect(r.status).toBe(429);
		expect(r.cookie).toBeNull();
		expect(r.body).toContain('Too many sign-in attempts');
	});
});
