// Stored script injection, tried as an attacker would: hostile text goes into every free-text
// field a user can set, then every page that shows it is opened in Chromium (markers hovered,
// popups opened) and no script may run. Two layers are under test: user text reaches the DOM as
// text only, and the Content-Security-Policy blocks inline script should a slip ever happen.
// OWASP ASVS 5.0 V3 (Web Frontend Security): output encoding and a CSP that forbids inline script.
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { estimateFacetsOf, planFacetsOf } from '../../geodata/scene';
import { openBrowser, signInAs } from '../helpers/browser';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';

/** For fields with a short limit: one handler, still a full attack. */
const short = (field: string) => `<img src=x onerror="__xss.push('${field}')">`;

/** Each payload reports back through `window.__xss` with the field it was put in. */
const payload = (field: string) =>
	`<img src=x onerror="window.__xss.push('${field}')">` +
	`"'><svg onload="window.__xss.push('${field}')"></svg>` +
	`</script><script>window.__xss.push('${field}')</script>`;

let server: TestServer;
let ctx: BrowserContext;
let page: Page;
let siteId: string;
let estimateId: string;
const dialogs: string[] = [];

async function formPost(path: string, fields: Record<string, string>) {
	const r = await page.request.post(`${server.url}${path}`, {
		form: fields,
		headers: { origin: server.url, accept: 'text/html' },
		maxRedirects: 0
	});
	const text = await r.text();
	expect(r.status(), `${path} answered ${r.status()}: ${text.slice(0, 500)}`).toBeLessThan(400);
	expect(text, `${path} refused the fields`).not.toMatch(/"type":"failure"|role="alert"/);
	return r;
}

async function apiPost(path: string, body: unknown) {
	const r = await page.request.post(`${server.url}${path}`, {
		data: body,
		headers: { origin: server.url }
	});
	expect(r.status(), `${path} answered ${r.status()}: ${await r.text()}`).toBeLessThan(300);
	return r.json();
}

/** Opens a page and reports every payload that ran there, and every dialog that opened. */
async function ranOn(path: string, interact?: (p: Page) => Promise<void>): Promise<string[]> {
	await page.goto(`${server.url}${path}`);
	await page.waitForLoadState('networkidle');
	if (interact) await interact(page);
	return page.evaluate(() => (window as unknown as { __xss: string[] }).__xss);
}

beforeAll(async () => {
	server = await startServer(seededDataDir('e2e-injection'));
	ctx = await openBrowser({ width: 1280, height: 900 });
	// A payload that runs pushes here; the page's own scripts never touch it.
	await ctx.addInitScript(() => {
		(window as unknown as { __xss: string[] }).__xss = [];
	});
	page = ctx.pages()[0] ?? (await ctx.newPage());
	page.on('dialog', (d) => {
		dialogs.push(d.message());
		void d.dismiss();
	});
	await signInAs(page, server.url, DEMO.owner);

	// A site whose every text field is hostile, through the New site form.
	const created = await formPost('/sites/new', {
		customerName: short('customer'),
		customerEmail: '',
		customerPhone: short('ph'),
		address: payload('address'),
		lat: '35.5197',
		lon: '-74.4613',
		notes: payload('notes'),
		gateCode: short('gate'),
		pets: payload('pets'),
		waterSource: payload('water')
	});
	const location = created.headers()['location'] ?? '';
	siteId = location.split('/').filter(Boolean).at(-1) ?? '';
	expect(
		siteId,
		`the New site form answered ${created.status()} ${location} ${(await created.text()).slice(0, 300)}`
	).toMatch(/^[0-9a-f-]{36}$/);

	// A roof plan and an estimate whose facet labels are hostile.
	const h = 'h01';
	const facets = planFacetsOf(h).map((f, i) => ({ ...f, label: short(`facet-label-${i}`) }));
	await apiPost('/api/roof-plans', { siteId, facets, note: payload('plan-note') });
	const est = await apiPost('/api/estimates', {
		siteId,
		save: true,
		facets: estimateFacetsOf(h).map((f, i) => ({ ...f, label: short(`estimate-facet-${i}`) }))
	});
	estimateId = est.estimate.id;

	// Team: a member's name and an API token's name.
	await formPost('/team?/invite', {
		name: short('member-name'),
		email: 'mallory@harborpine.example',
		role: 'crew',
		password: 'a long enough password 2026'
	});
	await formPost('/team?/token', { name: short('token-name') });

	// Settings: the imagery attribution is shown under every map.
	await formPost('/settings?/imagery', { template: '', attribution: payload('attribution') });
}, 240_000);

afterAll(async () => {
	await ctx?.close();
	await server?.stop();
});

describe('hostile text in every free-text field', () => {
	it('runs no script on the Sites list, with every marker hovered and its popup opened', async () => {
		const ran = await ranOn('/sites', async (p) => {
			const markers = p.locator('[data-testid=sites-map] path.leaflet-interactive');
			await expect.poll(() => markers.count()).toBeGreaterThan(0);
			const n = await markers.count();
			for (let i = 0; i < n; i++) {
				await markers.nth(i).hover({ force: true });
				await markers.nth(i).click({ force: true });
			}
			await p.locator('.leaflet-tooltip').first().waitFor({ state: 'attached' });
		});
		expect(ran).toEqual([]);
		// The text is there, shown as text.
		expect(await page.locator('body').innerText()).toContain('<img src=x onerror=');
	});

	it.each([
		['Today', '/'],
		['the site page', () => `/sites/${siteId}`],
		['the roof editor', () => `/sites/${siteId}/roof`],
		['the Estimates list', '/estimates'],
		['the estimate page', () => `/estimates/${estimateId}`],
		['Team', '/team'],
		['Rates', '/rates'],
		['Settings', '/settings'],
		['Crew sheets', '/crew'],
		['the API docs', '/api/docs']
	] as const)('runs no script on %s', async (_name, path) => {
		const ran = await ranOn(typeof path === 'function' ? path() : path);
		expect(ran).toEqual([]);
		expect(dialogs).toEqual([]);
	});

	it('shows the hostile facet labels as text in the roof editor', async () => {
		await page.goto(`${server.url}/sites/${siteId}/roof`);
		await expect
			.poll(() => page.locator('body').innerText(), { timeout: 30_000 })
			.toContain('facet-label-0');
		expect(await page.evaluate(() => (window as unknown as { __xss: string[] }).__xss)).toEqual([]);
	});
});

describe('the Content-Security-Policy', () => {
	it('is sent on pages, allows no inline script without a nonce, and blocks one that slips in', async () => {
		const r = await page.request.get(`${server.url}/`);
		const csp = r.headers()['content-security-policy'] ?? '';
		expect(csp).toMatch(/script-src [^;]*'self'/);
		expect(csp).toMatch(/script-src [^;]*'nonce-/);
		expect(csp).not.toMatch(/script-src [^;]*'unsafe-inline'/);
		expect(csp).toMatch(/object-src 'none'/);
		expect(csp).toMatch(/frame-ancestors 'none'/);

		// A future slip, simulated: markup with an inline handler put into the live page.
		await page.goto(`${server.url}/`);
		await page.evaluate(() => {
			const div = document.createElement('div');
			div.innerHTML = `<img src=x onerror="window.__xss.push('slip')">`;
			document.body.append(div);
		});
		await page.locator('img[src=x]').waitFor({ state: 'attached' });
		// An error event fires at once for src=x; give the handler (if allowed) its turn to run.
		await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => setTimeout(r, 0))));
		expect(await page.evaluate(() => (window as unknown as { __xss: string[] }).__xss)).toEqual([]);
	});
});
