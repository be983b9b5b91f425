// The role table against the routes that really exist. The route list is read from the
// src/routes folders (tests/helpers/routes.ts, following SvelteKit's routing docs), not from the
// table, so a new page, action or endpoint without a row fails here before anyone can open it.
import { describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import {
	ACCESS,
	PUBLIC,
	PUBLIC_FILES,
	ROLES,
	isPublicFile,
	navFor,
	rolesFor,
	rolesForRoute
} from '../../../src/lib/roles';
import { actionNames, endpointMethods, listRoutes, patternOf } from '../../helpers/routes';

const routes = listRoutes();

/** A concrete path for a pattern: each `[param]` becomes a made-up segment value. */
const sample = (pattern: string) => pattern.replace(/\[(?:\.\.\.)?\w+\]/g, 'p1');

describe('the route list read from src/routes', () => {
	it('finds the pages, actions and endpoints a reader can see in the folders', () => {
		// Spot checks against the folder tree as committed, so a broken walker cannot pass quietly.
		const byId = new Map(routes.map((r) => [r.id, r]));
		expect(byId.get('/(app)')?.pattern).toBe('/');
		expect(byId.get('/(app)/sites/[id=id]/roof')).toMatchObject({
			pattern: '/sites/[id]/roof',
			page: true
		});
		expect(byId.get('/(app)/team')?.actions).toEqual([
			'invite',
			'role',
			'deactivate',
			'reactivate',
			'token',
			'revoke'
		]);
		expect(byId.get('/(auth)/sign-in')?.actions).toEqual(['default']);
		expect(byId.get('/api/estimates/[id]')?.methods.sort()).toEqual(['GET', 'PATCH']);
		expect(routes.length).toBeGreaterThanOrEqual(30);
	});

	it('reads action names and endpoint methods from source text', () => {
		expect(
			actionNames(`export const actions: Actions = {
	// a comment with a brace { and a quote '
	first: async (event) => { const o = { a: 1, b: '}' }; return o; },
	async second(event) { return [1, 2]; },
	third: (e) => e
};`)
		).toEqual(['first', 'second', 'third']);
		expect(actionNames('export const load = () => ({});')).toEqual([]);
		expect(
			endpointMethods(
				'export const GET = () => 1;\nexport async function POST() {}\nexport const HELPER = 2;'
			).sort()
		).toEqual(['GET', 'POST']);
		expect(patternOf('/(app)/sites/[id=id]/roof')).toBe('/sites/[id]/roof');
		expect(patternOf('/(app)')).toBe('/');
	});
});

describe('ACCESS', () => {
	it('has a row for every route, public ones included', () => {
		const missing = routes.filter((r) => rolesForRoute(r.id) === undefined).map((r) => r.id);
		expect(missing).toEqual([]);
	});

	it('has no row for a route that does not exist', () => {
		const real = new Set(routes.map((r) => r.pattern));
		const stale = ACCESS.map((a) => a.route).filter((p) => !real.has(p));
		expect(stale).toEqual([]);
	});

	it('has one row per route', () => {
		const seen = ACCESS.map((a) => a.route);
		expect(seen.length).toBe(new Set(seen).size);
	});

	it('answers the same for a route id and for a concrete path of that route', () => {
		for (const r of routes) {
			// `/sites/new` is a static route beside `/sites/[id]`; the sample `p1` hits the param one.
			expect(rolesFor(sample(r.pattern)), r.id).toEqual(rolesForRoute(r.id));
		}
		expect(rolesFor('/sites/new')).toEqual(rolesForRoute('/(app)/sites/new'));
	});

	it("matches '/' to the Today page only, so a made-up path gets no roles", () => {
		expect(rolesFor('/')).toEqual(ROLES);
		for (const p of [
			'/new-thing',
			'/api/new-thing',
			'/api/team/export',
			'/sites/p1/delete',
			'/team/extra',
			'/sign-in/extra',
			'/account/',
			'//sites'
		]) {
			expect(rolesFor(p), p).toBeUndefined();
		}
		expect(rolesForRoute('/(app)/new-thing')).toBeUndefined();
		expect(rolesForRoute('/api/new-thing')).toBeUndefined();
	});

	it('keeps the public list in the same table', () => {
		const open = ACCESS.filter((a) => a.roles === PUBLIC).map((a) => a.route);
		// Sign-in must open without a session; the health probe and the sample imagery carry no data;
		// the customer's proposal, its photos, the final invoice and the payment service's webhook
		// have no account (a private link, a signature).
		expect(open.sort()).toEqual([
			'/api/health',
			'/api/payments/webhook',
			'/i/[token]',
			'/p/[token]',
			'/p/[token]/photos/[id]',
			'/sign-in',
			'/tiles/[z]/[x]/[y]',
			'/tiles/tiles.json'
		]);
	});

	it('opens only built assets and files in static/ outside the routes', () => {
		for (const p of PUBLIC_FILES) {
			// /service-worker.js is built by SvelteKit from src/service-worker.ts.
			expect(
				p === '/_app/' ||
					(p === '/service-worker.js' && fs.existsSync('src/service-worker.ts')) ||
					fs.existsSync(path.join('static', p)),
				p
			).toBe(true);
		}
		expect(isPublicFile('/_app/immutable/entry/start.js')).toBe(true);
		expect(isPublicFile('/favicon.svg')).toBe(true);
		expect(isPublicFile('/favicon.svg/x')).toBe(false);
		expect(isPublicFile('/sites')).toBe(false);
	});

	it('gives crew the Today page, crew sheets and their jobs, site photos, account, sign-out and /api/me only', () => {
		const crew = routes
			.filter((r) => {
				const a = rolesForRoute(r.id);
				return a !== PUBLIC && a?.includes('crew');
			})
			.map((r) => r.pattern)
			.sort();
		expect(crew).toEqual([
			'/',
			'/account',
			'/api/jobs/[id]',
			'/api/jobs/[id]/log',
			'/api/jobs/[id]/photos',
			'/api/me',
			'/crew',
			'/crew/[id]',
			'/photos/[id]/[rendition]',
			'/sign-out'
		]);
	});
});

describe('navFor', () => {
	it('shows each role only the links the table lets it open', () => {
		for (const role of ROLES) {
			for (const item of navFor(role)) {
				const a = rolesFor(item.href);
				expect(a !== PUBLIC && a?.includes(role), `${role} ${item.href}`).toBe(true);
			}
		}
		expect(navFor('crew').map((n) => n.href)).toEqual(['/', '/crew']);
		expect(navFor('owner').map((n) => n.href)).toEqual([
			'/',
			'/sites',
			'/estimates',
			'/schedule',
			'/crew',
			'/rates',
			'/team',
			'/outbox',
			'/reports',
			'/data',
			'/settings',
			'/audit'
		]);
	});
});
