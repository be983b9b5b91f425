// The light Leaflet maps in Chromium: Sites list markers, the New site position picker, and a
// site page's read-only roof plan (at phone width too).
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { house, planFacetsOf } from '../../geodata/scene';
import { openBrowser, signInAs } from '../helpers/browser';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let ctx: BrowserContext;
let page: Page;
type Site = { id: string; address: string; lat: number; lon: number };
/** The seed puts a scene house's site at the house's address. */
const siteOfHouse = (houseId: string) =>
	sites.find((s) => s.address === house(houseId)!.properties.address)!;
let sites: Site[];

beforeAll(async () => {
	server = await startServer(seededDataDir('e2e-sites'));
	ctx = await openBrowser({ width: 1280, height: 900 });
	page = ctx.pages()[0] ?? (await ctx.newPage());
	await signInAs(page, server.url, DEMO.estimator);
	sites = (await (await page.request.get(`${server.url}/api/sites`)).json()).sites;
});
afterAll(async () => {
	await ctx?.close();
	await server?.stop();
});

const markers = (p: Page) => p.locator('[data-testid=sites-map] path.leaflet-interactive');

describe('the Sites list map', () => {
	it('shows one marker per site, whose popup links to that site', async () => {
		await page.goto(`${server.url}/sites`);
		await expect.poll(() => markers(page).count()).toBe(sites.length);
		// The two sites outside the sample neighbourhood stand apart: pick the first marker.
		await markers(page).first().click({ force: true });
		const link = page.locator('.leaflet-popup-content a');
		await link.waitFor();
		const address = await link.innerText();
		const site = sites.find((s) => s.address === address);
		expect(site, `popup names a listed site: ${address}`).toBeDefined();
		expect(await link.getAttribute('href')).toBe(`/sites/${site!.id}`);
		await Promise.all([page.waitForURL(`${server.url}/sites/${site!.id}`), link.click()]);
		expect(await page.locator('h1').innerText()).toBe(site!.address);
	});

	it('loads Leaflet styles and marker graphics without a request failing', async () => {
		// Leave the page the last test ended on first, so none of its requests, cut short by the
		// navigation, counts here.
		await page.goto('about:blank');
		const failed: string[] = [];
		const onResponse = (r: { status: () => number; url: () => string }) => {
			if (r.status() >= 400) failed.push(`${r.status()} ${r.url()}`);
		};
		const onFailed = (r: { url: () => string }) => failed.push(`failed ${r.url()}`);
		page.on('response', onResponse);
		page.on('requestfailed', onFailed);
		await page.goto(`${server.url}/sites`);
		await expect.poll(() => markers(page).count()).toBe(sites.length);
		await page.waitForLoadState('networkidle');
		page.off('response', onResponse);
		page.off('requestfailed', onFailed);
		expect(failed).toEqual([]);
		// Leaflet's own CSS is in the bundle: its container class is styled
		const overflow = await page
			.locator('[data-testid=sites-map]')
			.evaluate((el) => getComputedStyle(el).overflow);
		expect(overflow).toBe('hidden');
	});
});

describe('the New site form', () => {
	it('sets the position from a click, moves the marker when lat/lon are typed, and saves', async () => {
		await page.goto(`${server.url}/sites/new`);
		const map = page.getByTestId('position-map');
		await map.locator('.leaflet-tile-loaded').first().waitFor();
		const box = (await map.boundingBox())!;
		const A = { x: box.x + box.width * 0.3, y: box.y + box.height * 0.4 };
		const B = { x: box.x + box.width * 0.7, y: box.y + box.height * 0.6 };
		await page.mouse.click(A.x, A.y);
		const latA = Number(await page.getByLabel('Latitude', { exact: true }).inputValue());
		const lonA = Number(await page.getByLabel('Longitude', { exact: true }).inputValue());
		await page.mouse.click(B.x, B.y);
		const latB = Number(await page.getByLabel('Latitude', { exact: true }).inputValue());
		const lonB = Number(await page.getByLabel('Longitude', { exact: true }).inputValue());
		// screen down = south, screen right = east
		expect(latB).toBeLessThan(latA);
		expect(lonB).toBeGreaterThan(lonA);
		const marker = map.locator('path');
		const centre = async () => {
			const b = (await marker.last().boundingBox())!;
			return { x: b.x + b.width / 2, y: b.y + b.height / 2 };
		};
		const atB = await centre();
		expect(Math.hypot(atB.x - B.x, atB.y - B.y)).toBeLessThan(2);
		// typing A's position brings the marker back to where A was clicked
		await page.getByLabel('Latitude', { exact: true }).fill(String(latA));
		await page.getByLabel('Longitude', { exact: true }).fill(String(lonA));
		await expect
			.poll(async () => {
				const c = await centre();
				return Math.hypot(c.x - A.x, c.y - A.y);
			})
			.toBeLessThan(2);

		await page.getByLabel('Customer name').fill('Wendell Ashcombe');
		await page.getByLabel('Street address').fill('11 Heron Walk, Wrenfield');
		await page.getByRole('button', { name: 'Save site' }).click();
		await page.waitForURL(/\/sites\/[0-9a-f-]{36}$/);
		expect(await page.locator('h1').innerText()).toBe('11 Heron Walk, Wrenfield');
		expect(await page.getByText(`${latA.toFixed(6)}, ${lonA.toFixed(6)}`).count()).toBe(1);
	});

	it('keeps the form and says what is wrong when the latitude is out of range', async () => {
		const before = (await (await page.request.get(`${server.url}/api/sites`)).json()).sites.length;
		await page.goto(`${server.url}/sites/new`);
		await page.getByLabel('Customer name').fill('Wendell Ashcombe');
		await page.getByLabel('Street address').fill('12 Heron Walk, Wrenfield');
		await page.getByLabel('Latitude', { exact: true }).fill('95');
		await page.getByLabel('Longitude', { exact: true }).fill('-74.46');
		await page.getByRole('button', { name: 'Save site' }).click();
		await page.getByText('Latitude must be between -90 and 90.').waitFor();
		expect(await page.getByLabel('Street address').inputValue()).toBe('12 Heron Walk, Wrenfield');
		expect(await page.getByLabel('Latitude', { exact: true }).getAttribute('aria-invalid')).toBe(
			'true'
		);
		const after = (await (await page.request.get(`${server.url}/api/sites`)).json()).sites.length;
		expect(after).toBe(before);
	});
});

describe('a site page with a roof plan', () => {
	it('shows the latest plan read-only over the imagery with its totals, also at 390 px', async () => {
		// h08 (asymmetric gable) is one of the houses the demo leaves unmeasured.
		const site = siteOfHouse('h08');
		const facets = planFacetsOf('h08');
		const saved = await page.request.post(`${server.url}/api/roof-plans`, {
			data: { siteId: site.id, facets }
		});
		expect(saved.status()).toBe(201);
		const truth = house('h08')!.properties;

		const phone = await openBrowser({ width: 390, height: 844 });
		try {
			await phone.addCookies(await ctx.cookies());
			const p = phone.pages()[0] ?? (await phone.newPage());
			await p.goto(`${server.url}/sites/${site.id}`);
			const map = p.getByTestId('plan-map');
			await expect.poll(() => map.locator('path').count()).toBe(facets.length);
			const totals = await p.getByTestId('plan-totals').innerText();
			// Source: house h08's sloped area in geodata/scene.geojson, shown rounded to whole ft²
			expect(totals).toContain(`${Math.round(truth.slopedAreaFt2).toLocaleString('en-US')} ft²`);
			expect(totals).toContain(truth.squares.toFixed(2));
			for (const f of facets) expect(await p.getByText(f.label, { exact: true }).count()).toBe(1);
			expect(await p.getByRole('link', { name: 'Open roof editor' }).count()).toBe(1);
			// nothing wider than the phone
			expect(await p.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
		} finally {
			await phone.close();
		}
	});

	it('invites tracing the roof when there is no plan yet', async () => {
		const site = siteOfHouse('h01');
		await page.goto(`${server.url}/sites/${site.id}`);
		expect(await page.getByText('No roof plan yet.', { exact: false }).count()).toBe(1);
		expect(await page.getByTestId('plan-map').count()).toBe(0);
	});
});
