// The server guard (hooks.server.ts) on its own, with no second check behind it: a route the
// table has no row for must be refused even though no load or endpoint would refuse it.
// SvelteKit matches the route before `handle` runs and passes its id as `event.route.id`
// (https://svelte.dev/docs/kit/hooks#Server-hooks-handle, RequestEvent.route).
import { isHttpError, isRedirect, type RequestEvent } from '@sveltejs/kit';
import { describe, expect, it, vi } from 'vitest';
import { guardRoutes } from '../../../src/hooks.server';
import type { Role } from '../../../src/lib/roles';

type Caller = { role: Role; via: 'session' | 'token' } | null;

async function guard(
	routeId: string | null,
	path: string,
	caller: Caller,
	init: { method?: string; origin?: string } = {}
): Promise<number | string> {
	const url = new URL(path, 'http://clearpitch.test');
	const event = {
		url,
		route: { id: routeId },
		locals: {
			user: caller && {
				id: 'u1',
				email: 'someone@harborpine.example',
				name: 'Someone',
				companyId: 'c1',
				...caller
			},
			sessionId: null
		},
		request: new Request(url, {
			method: init.method ?? 'GET',
			headers: init.origin ? { origin: init.origin } : {}
		})
	} as unknown as RequestEvent;
	const resolve = vi.fn(async () => new Response('through'));
	try {
		await guardRoutes({ event, resolve });
		expect(resolve).toHaveBeenCalledOnce();
		return 'through';
	} catch (e) {
		if (isHttpError(e)) return e.status;
		if (isRedirect(e)) return `${e.status} ${e.location}`;
		throw e;
	}
}

const crew: Caller = { role: 'crew', via: 'session' };
const owner: Caller = { role: 'owner', via: 'session' };
const token: Caller = { role: 'owner', via: 'token' };

describe('the route guard', () => {
	it('refuses a route that has no row, to every role', async () => {
		expect(await guard('/(app)/new-thing', '/new-thing', crew)).toBe(403);
		expect(await guard('/(app)/new-thing', '/new-thing', owner)).toBe(403);
		expect(await guard('/api/new-thing', '/api/new-thing', owner)).toBe(403);
		expect(await guard('/api/new-thing', '/api/new-thing', token)).toBe(403);
		expect(await guard('/(app)/sites/[id=id]/delete', '/sites/p1/delete', owner)).toBe(403);
	});

	it('judges the route SvelteKit matched, not the raw path', async () => {
		// `%74` is `t`: the router decodes it and runs /api/team, so the guard must refuse crew.
		expect(await guard('/api/team', '/api/%74eam', crew)).toBe(403);
		expect(await guard('/(app)/team', '/%74eam', crew)).toBe(403);
		// An encoded `a` still reaches the API, so a signed-out caller gets the API's 401.
		expect(await guard('/api/team', '/%61pi/team', null)).toBe(401);
	});

	it('lets the roles in the table through and refuses the others', async () => {
		expect(await guard('/(app)/team', '/team', owner)).toBe('through');
		expect(await guard('/(app)/team', '/team', crew)).toBe(403);
		expect(await guard('/(app)/crew', '/crew', crew)).toBe('through');
		expect(await guard('/(app)', '/', crew)).toBe('through');
		expect(await guard('/api/me', '/api/me', crew)).toBe('through');
	});

	it('sends a signed-out caller to sign in, or answers 401 on the API, route or not', async () => {
		expect(await guard('/(app)/sites', '/sites', null)).toBe('303 /sign-in?next=%2Fsites');
		expect(await guard('/(app)/new-thing', '/new-thing', null)).toBe(
			'303 /sign-in?next=%2Fnew-thing'
		);
		// No route at all: a signed-out caller is not told whether a path exists.
		expect(await guard(null, '/no-such-page', null)).toBe('303 /sign-in?next=%2Fno-such-page');
		expect(await guard(null, '/api/no-such-thing', null)).toBe(401);
		expect(await guard('/api/team', '/api/team', null)).toBe(401);
	});

	it('lets a signed-in caller reach SvelteKit’s 404 for a path with no route', async () => {
		expect(await guard(null, '/no-such-page', crew)).toBe('through');
		expect(await guard(null, '/api/no-such-thing', token)).toBe('through');
	});

	it('opens the public rows and the framework’s own files without a session', async () => {
		expect(await guard('/(auth)/sign-in', '/sign-in', null)).toBe('through');
		expect(await guard('/api/health', '/api/health', null)).toBe('through');
		expect(await guard('/tiles/[z]/[x]/[y]', '/tiles/1/2/3.webp', null)).toBe('through');
		expect(await guard('/tiles/tiles.json', '/tiles/tiles.json', null)).toBe('through');
		expect(await guard(null, '/_app/version.json', null)).toBe('through');
	});

	it('keeps API tokens to the API and refuses cross-origin JSON writes', async () => {
		expect(await guard('/(app)/sites', '/sites', token)).toBe(403);
		expect(await guard('/api/sites', '/api/sites', token)).toBe('through');
		expect(
			await guard('/api/estimates', '/api/estimates', owner, {
				method: 'POST',
				origin: 'https://elsewhere.example'
			})
		).toBe(403);
		expect(
			await guard('/api/estimates', '/api/estimates', owner, {
				method: 'POST',
				origin: 'http://clearpitch.test'
			})
		).toBe('through');
	});
});
