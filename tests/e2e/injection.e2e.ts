// Stored and reflected script injection, in Chromium against the built server: a script payload
// goes into every free-text field a user can set (through the forms a person uses, or the API
// where that is the only way in), then every page that shows that text is opened and the map
// tooltips and popups are hovered and clicked. No payload may run, no dialog may open, the text
// must show as the literal characters typed, and the page must raise no Content-Security-Policy
// violation (the policy is a second line; the first is that user text never becomes markup).
//
// Sources: OWASP ASVS 5.0, chapter V3 "Web Frontend Security" (output encoding in the browser
// and the Content-Security-Policy response header) and chapter V1 "Encoding and Sanitization";
// OWASP "Cross Site Scripting Prevention Cheat Sheet" (safe sinks: textContent, never
// innerHTML); Leaflet 1.9 reference, Layer.bindTooltip/bindPopup: "content: String|HTMLElement"
// — a string is set as HTML, an element is inserted as is; W3C "Content Security Policy Level 3"
// (script-src nonces, the securitypolicyviolation event).
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { planFacetsOf } from '../../geodata/scene';
import { openBrowser, signInAs } from '../helpers/browser';
import { startTestFakes, type TestFakes } from '../helpers/fakes';
import { linkIn } from '../helpers/proposal';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let fakes: TestFakes;
let ctx: BrowserContext;
let page: Page;
const dialogs: string[] = [];

/** Each bumps window.__xss when it runs; each tries a different way out of its context. */
const RUN = 'window.__xss=(window.__xss||0)+1';
const PAYLOADS = [
	`<img src=x onerror="${RUN}">`,
	`"><svg onload="${RUN}">`,
	`</script><script>${RUN}</script>`,
	`'><details open ontoggle="${RUN}">`,
	`<iframe srcdoc="<script>parent.__xss=(parent.__xss||0)+1</script>"></iframe>`,
	`<a href="javascript:${RUN}" id=cpx>x</a><img src=x onerror="document.getElementById('cpx').click()">`
];
/** For fields of 40–60 characters. */
const SHORT = '<svg onload=__xss=1>';
const tagged = (field: string, i: number) => `${field} ${PAYLOADS[i % PAYLOADS.length]}`;

const ADDRESS = tagged('9 Larkspur Row, Wrenfield', 0);
const CUSTOMER = tagged('Ottoline Varga', 1);
const NOTES = tagged('Side gate sticks', 2);
const PETS = tagged('Two dogs', 3);
const WATER = tagged('Spigot by garage', 4);
/** Facet labels are at most 60 characters. */
const LABEL_PAYLOADS = [
	'<img src=x onerror=__xss=1>',
	'"><svg onload=__xss=1>',
	'</script><script>__xss=1</script>',
	"'><details open ontoggle=__xss=1>"
];
const FACET_LABEL = (i: number) => `Facet ${i + 1} ${LABEL_PAYLOADS[i % LABEL_PAYLOADS.length]}`;
const PLAN_NOTE = tagged('Traced from imagery', 5);
const EXTRA_LABEL = tagged('Gutter brightening', 0);
const MEMBER = tagged('Ines Calloway', 2);
const TOKEN = tagged('Ledger sync', 3).slice(0, 80);
const ATTRIBUTION = tagged('Wrenfield imagery', 0);
const SIGNATURE = tagged('Ottoline Varga', 4);
const COMPANY_LINE = tagged('Insured', 5);

let siteId: string;
let estimateId: string;

beforeAll(async () => {
	// With the local mail fake: the proposal's private link only travels in its e-mail.
	fakes = await startTestFakes();
	server = await startServer(seededDataDir('e2e-injection'), fakes.env);
	ctx = await openBrowser({ width: 1280, height: 900 });
	// Runs before any page script, so a violation during start-up is caught too.
	await ctx.addInitScript(() => {
		const w = window as unknown as { __csp: string[] };
		w.__csp = [];
		document.addEventListener('securitypolicyviolation', (e) =>
			w.__csp.push(`${e.effectiveDirective} ${e.blockedURI} ${e.sample}`)
		);
	});
	page = ctx.pages()[0] ?? (await ctx.newPage());
	page.on('dialog', (d) => {
		dialogs.push(`${d.type()}: ${d.message()}`);
		void d.dismiss();
	});
	await signInAs(page, server.url, DEMO.owner);
});
afterAll(async () => {
	await ctx?.close();
	await server?.stop();
	await fakes?.stop();
});

/** No payload ran, no dialog opened, no policy violation on the page now open. */
async function expectClean(p: Page, where: string) {
	// Give event-driven payloads (onerror of a failed image, ontoggle) their turn.
	await p.waitForLoadState('networkidle');
	await p.evaluate(() => new Promise((r) => requestAnimationFrame(() => setTimeout(r, 50))));
	const state = await p.evaluate(() => {
		const w = window as unknown as { __xss?: number; __csp?: string[] };
		return { xss: w.__xss, csp: w.__csp ?? [] };
	});
	expect(state.xss, `a payload ran on ${where}`).toBeUndefined();
	expect(dialogs, `a dialog opened on ${where}`).toEqual([]);
	expect(state.csp, `CSP violations on ${where}`).toEqual([]);
	// The payload's own elements never reach the DOM.
	expect(await p.locator('#cpx, iframe[srcdoc], details[ontoggle]').count(), where).toBe(0);
}

async function visit(p: Page, path: string) {
	const res = await p.goto(`${server.url}${path}`);
	expect(res?.status(), path).toBeLessThan(400);
}

describe('payloads go in through the forms and the API', () => {
	it('a site from the New site form, every free-text field carrying a payload', async () => {
		await visit(page, '/sites/new');
		await page.getByLabel('Customer name').fill(CUSTOMER);
		await page.getByLabel('Customer phone (optional)').fill(SHORT);
		await page.getByLabel('Street address').fill(ADDRESS);
		await page.getByLabel('Gate code (optional)').fill(SHORT);
		await page.getByLabel('Pets (optional)').fill(PETS);
		await page.getByLabel('Water source (optional)').fill(WATER);
		await page.getByLabel('Notes').fill(NOTES);
		// Inside the sample neighbourhood, clear of the demo houses' markers.
		await page.getByLabel('Latitude', { exact: true }).fill('35.5195');
		await page.getByLabel('Longitude', { exact: true }).fill('-74.4610');
		await page.getByRole('button', { name: 'Save site' }).click();
		await page.waitForURL(/\/sites\/[0-9a-f-]{36}$/);
		siteId = page.url().split('/').pop()!;
		// Stored as typed: the fix is in how it is shown, not in changing what the owner wrote.
		const site = (await (await page.request.get(`${server.url}/api/sites/${siteId}`)).json()).site;
		expect(site.address).toBe(ADDRESS);
		expect(site.notes).toBe(NOTES);
		await expectClean(page, 'the new site page');
	});

	it('refuses a javascript: URL where a value could become a link or a tile source', async () => {
		await visit(page, '/settings');
		await page.getByLabel('XYZ URL template').fill(`javascript:${RUN}//{z}/{x}/{y}`);
		await page.getByRole('button', { name: 'Save imagery source' }).click();
		await page.getByText('Use an https:// URL that contains {z}, {x} and {y}').waitFor();
		// The customer e-mail is an <input type=email> and checked by zod as an address, so a
		// javascript: value cannot be stored there either; no other user value becomes a link.
		await expectClean(page, 'the refused forms');
	});

	it('a roof plan and an estimate through the API, with payload facet labels, note and extra', async () => {
		const facets = planFacetsOf('h08').map((f, i) => ({ ...f, label: FACET_LABEL(i) }));
		const saved = await page.request.post(`${server.url}/api/roof-plans`, {
			data: { siteId, facets, note: PLAN_NOTE }
		});
		expect(saved.status(), await saved.text()).toBe(201);
		const plan = (await saved.json()).plan;
		const est = await page.request.post(`${server.url}/api/estimates`, {
			// Saved from the plan: the server prices its stored facets, payload labels included.
			data: {
				siteId,
				roofPlanId: plan.id,
				extras: [{ label: EXTRA_LABEL, priceCents: 4500 }],
				save: true
			}
		});
		expect(est.status(), await est.text()).toBe(201);
		estimateId = (await est.json()).estimate.id;
	});

	it('a team member and an API token from the Team forms', async () => {
		await visit(page, '/team');
		await page.getByLabel('Name', { exact: true }).fill(MEMBER);
		await page.getByLabel('E-mail').fill('ines.calloway@harborpine.example');
		await page.getByLabel('First password').fill('larkspur-row-2026');
		await page.getByRole('button', { name: /invite|add/i }).click();
		await page.getByText(MEMBER, { exact: true }).first().waitFor();
		await page.getByLabel('Token name').fill(TOKEN);
		await page.getByRole('button', { name: 'Create token' }).click();
		await page.getByText(TOKEN, { exact: true }).first().waitFor();
		await expectClean(page, 'Team after the forms');
	});
});

describe('no payload runs where the text is shown', () => {
	it('the Sites list and its map: hover the marker for its tooltip, click it for its popup', async () => {
		await visit(page, `/sites?q=${encodeURIComponent('Larkspur')}`);
		const marker = page.locator('[data-testid=sites-map] path.leaflet-interactive');
		await expect.poll(() => marker.count()).toBe(1);
		await marker.hover({ force: true });
		const tooltip = page.locator('.leaflet-tooltip');
		await tooltip.waitFor();
		// The address shows as the characters typed, not as markup.
		expect(await tooltip.textContent()).toBe(ADDRESS);
		expect(await tooltip.locator('img, svg, script, iframe, details').count()).toBe(0);
		await marker.click({ force: true });
		const popup = page.locator('.leaflet-popup-content');
		await popup.waitFor();
		expect(await popup.locator('a').textContent()).toBe(ADDRESS);
		expect(await popup.textContent()).toContain(CUSTOMER);
		expect(await popup.locator('img, svg, script, iframe, details').count()).toBe(0);
		expect(await page.getByText(ADDRESS, { exact: true }).count()).toBeGreaterThan(0);
		await expectClean(page, 'the Sites list');
	});

	it('a search for a payload is shown back as text', async () => {
		await visit(page, `/sites?q=${encodeURIComponent(PAYLOADS[1])}`);
		expect(await page.locator('#q').inputValue()).toBe(PAYLOADS[1]);
		await expectClean(page, 'the Sites search');
	});

	it('the site page: customer, access fields, notes, facet labels, version note', async () => {
		await visit(page, `/sites/${siteId}`);
		await expect
			.poll(() => page.getByTestId('plan-map').locator('path').count())
			.toBe(planFacetsOf('h08').length);
		expect(await page.locator('h1').textContent()).toBe(ADDRESS);
		const body = await page.locator('main').textContent();
		for (const text of [CUSTOMER, NOTES, PETS, WATER, FACET_LABEL(0)]) expect(body).toContain(text);
		await expectClean(page, 'the site page');
	});

	for (const kind of ['maplibre', 'leaflet'] as const) {
		it(`the roof editor (${kind}): facet labels on the map and in the list`, async () => {
			const c = kind === 'leaflet' ? await openBrowser({ webgl: false }) : ctx;
			try {
				if (c !== ctx) {
					await c.addCookies(await ctx.cookies());
					await c.addInitScript(() => {
						const w = window as unknown as { __csp: string[] };
						w.__csp = [];
						document.addEventListener('securitypolicyviolation', (e) =>
							w.__csp.push(`${e.effectiveDirective} ${e.blockedURI} ${e.sample}`)
						);
					});
				}
				const p = c === ctx ? page : (c.pages()[0] ?? (await c.newPage()));
				if (p !== page) p.on('dialog', (d) => void d.dismiss().then(() => dialogs.push('dialog')));
				await visit(p, `/sites/${siteId}/roof`);
				await p.waitForFunction((k) => window.__clearpitchMap?.kind === k, kind, {
					timeout: 30_000
				});
				const label = p.locator('.cp-map-label strong').first();
				await label.waitFor();
				expect(await label.textContent()).toMatch(/^Facet \d /);
				expect(await p.locator('.cp-map-label img, .cp-map-label svg').count()).toBe(0);
				expect(await p.locator('body').textContent()).toContain(PLAN_NOTE);
				await expectClean(p, `the roof editor (${kind})`);
			} finally {
				if (c !== ctx) await c.close();
			}
		});
	}

	it('the Estimates list and the estimate page (line items, notes, chart)', async () => {
		await visit(page, '/estimates');
		await page.getByTestId('estimate-row').getByText(ADDRESS, { exact: true }).first().waitFor();
		await expectClean(page, 'the Estimates list');
		await visit(page, `/estimates/${estimateId}`);
		await page.locator('canvas').first().waitFor();
		const body = await page.locator('main').textContent();
		expect(body).toContain(EXTRA_LABEL);
		expect(body).toContain(FACET_LABEL(0));
		await expectClean(page, 'the estimate page');
	});

	it('Today, Team, Rates, Crew sheets, Account, Settings and the API page', async () => {
		for (const path of ['/', '/team', '/rates', '/crew', '/account', '/settings', '/api/docs']) {
			await visit(page, path);
			await expectClean(page, path);
		}
		await visit(page, '/team');
		expect(await page.getByText(MEMBER, { exact: true }).count()).toBeGreaterThan(0);
		expect(await page.getByText(TOKEN, { exact: true }).count()).toBeGreaterThan(0);
	});

	it("the proposal, the customer's page with a payload signature, and the Outbox", async () => {
		await visit(page, '/settings');
		await page.getByLabel('Licence and insurance line').fill(COMPANY_LINE);
		await page.getByRole('button', { name: 'Save company details' }).click();
		await page.getByText('Proposals sent from now on carry these details.').waitFor();
		const ready = await page.request.patch(`${server.url}/api/estimates/${estimateId}`, {
			data: { status: 'ready' }
		});
		expect(ready.status(), await ready.text()).toBe(200);
		await visit(page, `/estimates/${estimateId}/proposal`);
		const doc = await page.getByTestId('proposal').textContent();
		for (const text of [ADDRESS, CUSTOMER, FACET_LABEL(0), COMPANY_LINE])
			expect(doc).toContain(text);
		await expectClean(page, 'the proposal page');
		await page.getByLabel('Customer’s e-mail').fill('ottoline.varga@wrenfield.example');
		await page.getByRole('button', { name: 'Send proposal' }).click();
		await page.getByText('Version 1 sent to').waitFor();
		await expectClean(page, 'the proposal page after sending');
		// The e-mail's HTML part carries the payloads escaped, as text.
		const mail = fakes.smtp.messages().at(-1)!;
		expect(mail.html).not.toContain(PAYLOADS[0]);
		expect(mail.html).toContain('&lt;img src=x onerror=');

		const customer = await openBrowser({ width: 390, height: 844 });
		try {
			await customer.addInitScript(() => {
				const w = window as unknown as { __csp: string[] };
				w.__csp = [];
				document.addEventListener('securitypolicyviolation', (e) =>
					w.__csp.push(`${e.effectiveDirective} ${e.blockedURI} ${e.sample}`)
				);
			});
			const p = customer.pages()[0] ?? (await customer.newPage());
			p.on('dialog', (d) => void d.dismiss().then(() => dialogs.push('dialog')));
			await p.goto(linkIn(mail.text));
			await expectClean(p, "the customer's page");
			await p.getByLabel('Your full name, as your signature').fill(SIGNATURE);
			await p.getByRole('checkbox', { name: /I agree to the work/ }).check();
			await p.getByRole('button', { name: 'Accept proposal' }).click();
			await p.getByTestId('answer-banner').waitFor();
			expect(await p.getByTestId('answer-banner').textContent()).toContain(SIGNATURE);
			await expectClean(p, "the customer's page after accepting");
		} finally {
			await customer.close();
		}
		await visit(page, `/estimates/${estimateId}/proposal`);
		expect(await page.getByTestId('proposal-answer').textContent()).toContain(SIGNATURE);
		await expectClean(page, 'the proposal page with the answer');
		await visit(page, `/estimates/${estimateId}`);
		await expectClean(page, 'the estimate page with the answer');
		await visit(page, '/outbox');
		expect(await page.getByTestId('outbox').textContent()).toContain(ADDRESS);
		await expectClean(page, 'the Outbox');
	});

	it('an imagery attribution with a payload, on the Leaflet maps and in the editor', async () => {
		await visit(page, '/settings');
		// A reserved .example host: its tiles never load here, the attribution still shows.
		await page
			.getByLabel('XYZ URL template')
			.fill('https://imagery.wrenfield.example/{z}/{x}/{y}.png');
		await page.getByLabel('Attribution shown on the map').fill(ATTRIBUTION);
		await page.getByRole('button', { name: 'Save imagery source' }).click();
		await page.getByText(/saved/i).first().waitFor();
		await expectClean(page, 'Settings after saving');

		await visit(page, `/sites?q=Larkspur`);
		const attr = page.locator('[data-testid=sites-map] .leaflet-control-attribution');
		await expect.poll(() => attr.textContent()).toContain(ATTRIBUTION);
		await expectClean(page, 'the Sites map with the attribution');

		await visit(page, `/sites/${siteId}/roof`);
		await page.waitForFunction(() => window.__clearpitchMap?.kind === 'maplibre', null, {
			timeout: 30_000
		});
		const ml = page.locator('.maplibregl-ctrl-attrib-inner');
		await expect.poll(() => ml.textContent()).toContain(ATTRIBUTION);
		await expectClean(page, 'the roof editor with the attribution');
	});
});

describe('the Content-Security-Policy', () => {
	it('is sent on pages, lets only nonce’d scripts run, and blocks an inline handler that slips in', async () => {
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
			div.innerHTML = `<img src=x onerror="window.__slip=1">`;
			document.body.append(div);
		});
		await page.locator('img[src=x]').waitFor({ state: 'attached' });
		// The error event fires at once for src=x; give the handler (if allowed) its turn.
		await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => setTimeout(r, 0))));
		expect(await page.evaluate(() => (window as { __slip?: number }).__slip)).toBeUndefined();
	});
});
