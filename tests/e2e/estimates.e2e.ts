// The Estimates list is rendered on the server from the address bar (filters and page in the URL),
// filters in place with JavaScript, pages through links; an estimate page shows its chart, line
// items and status actions. In Chromium against the built server.
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, signInAs } from '../helpers/browser';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { prepareDataDir, sceneRequest, type Prepared } from '../integration/api-helpers';

let server: TestServer;
let ctx: BrowserContext;
let page: Page;
let prep: Prepared;
const made: Record<string, { id: string; totalCents: number; lines: number }> = {};

beforeAll(async () => {
	const dir = seededDataDir('e2e-estimates');
	prep = await prepareDataDir(dir);
	server = await startServer(dir);
	for (const house of ['h01', 'h02', 'h04', 'h05']) {
		const site = prep.sites.find((s) => s.houseId === house)!;
		const res = await fetch(`${server.url}/api/estimates`, {
			method: 'POST',
			headers: { authorization: `Bearer ${prep.ownerToken}`, 'content-type': 'application/json' },
			body: JSON.stringify({ ...sceneRequest(house), siteId: site.id, save: true })
		});
		expect(res.status).toBe(201);
		const body = await res.json();
		made[house] = {
			id: body.estimate.id,
			totalCents: body.price.totalCents,
			lines: body.price.lineItems.length
		};
	}
	ctx = await openBrowser({ width: 1280, height: 900 });
	page = ctx.pages()[0] ?? (await ctx.newPage());
	await signInAs(page, server.url, DEMO.estimator);
});
afterAll(async () => {
	await ctx?.close();
	await server?.stop();
});

const rows = () => page.getByTestId('estimate-row');
const waitRows = (n: number) =>
	page.waitForFunction(
		(want) =>
			document.querySelectorAll('[data-testid="estimate-row"]').length === want &&
			!document.querySelector('[aria-busy="true"]'),
		n
	);

describe('Estimates list', () => {
	it('filters and keeps the filter in the URL without reloading the page', async () => {
		await page.goto(`${server.url}/estimates`);
		await waitRows(4);
		await page.evaluate(() => ((window as unknown as { __stay: number }).__stay = 42));

		await page.getByLabel('Address or customer').fill('alder');
		await waitRows(2);
		const addresses = await rows().locator('a').allInnerTexts();
		expect(addresses.every((a) => a.includes('Alder Loop'))).toBe(true);
		expect(new URL(page.url()).searchParams.get('text')).toBe('alder');

		await page.getByLabel('Status').selectOption('ready');
		await page.getByText('No estimates match').waitFor();
		expect(new URL(page.url()).searchParams.get('status')).toBe('ready');
		await page.getByRole('link', { name: 'Clear the filters' }).click();
		await waitRows(4);
		expect(new URL(page.url()).search).toBe('');

		// Still the first document: no navigation happened, and the marker survived.
		expect(await page.evaluate(() => performance.getEntriesByType('navigation').length)).toBe(1);
		expect(await page.evaluate(() => (window as unknown as { __stay?: number }).__stay)).toBe(42);
	});

	it('sends the rows in the first HTML response, before any script runs', async () => {
		const res = await page.request.get(`${server.url}/estimates?text=alder`);
		expect(res.status()).toBe(200);
		const html = await res.text();
		expect(html.match(/data-testid="estimate-row"/g)?.length).toBe(2);
		expect(html).toContain('Alder Loop');
		expect(html).not.toContain('Loading estimates');
		expect(html).toContain('1–2 of 2');
	});

	it('keeps a filter through a reload, since it is in the URL', async () => {
		await page.goto(`${server.url}/estimates`);
		await waitRows(4);
		await page.getByLabel('Status').selectOption('draft');
		await page.waitForURL((u) => u.searchParams.get('status') === 'draft');
		await page.reload();
		await waitRows(4);
		expect(await page.getByLabel('Status').inputValue()).toBe('draft');
		expect(new URL(page.url()).searchParams.get('status')).toBe('draft');
	});

	it('filters with a plain GET form when JavaScript is off', async () => {
		const noJs = await openBrowser({ width: 1280, height: 900 });
		try {
			const p = noJs.pages()[0] ?? (await noJs.newPage());
			await signInAs(p, server.url, DEMO.estimator);
			await noJs.route('**/_app/**/*.js', (r) => r.abort());
			await p.goto(`${server.url}/estimates`);
			expect(await p.getByTestId('estimate-row').count()).toBe(4);
			await p.getByLabel('Address or customer').fill('alder');
			await Promise.all([
				p.waitForURL(/text=alder/),
				p.getByRole('button', { name: 'Apply' }).click()
			]);
			expect(await p.getByTestId('estimate-row').count()).toBe(2);
		} finally {
			await noJs.close();
		}
	});

	it('reads a bad filter in the link as no filter and says so, never a server error', async () => {
		const res = await page.goto(`${server.url}/estimates?status=nonsense&page=-3&site=12`);
		expect(res?.status()).toBe(200);
		await waitRows(4);
		expect(await page.getByTestId('estimates-ignored').innerText()).toMatch(
			/status and site and page number/
		);
		const long = await page.request.get(`${server.url}/estimates?text=${'x'.repeat(500)}`);
		expect(long.status()).toBe(200);
	});

	it('opens with the filter from the URL', async () => {
		const site = prep.sites.find((s) => s.houseId === 'h04')!;
		await page.goto(`${server.url}/estimates?site=${site.id}`);
		await waitRows(1);
		expect(await rows().first().innerText()).toContain(site.address);
		const chip = page.getByTestId('estimates-site-filter');
		expect(await chip.innerText()).toContain(site.address);
		// "All sites" drops the site and keeps the rest of the filter.
		await chip.getByRole('link', { name: 'All sites' }).click();
		await page.waitForURL((u) => !u.searchParams.has('site'));
		expect(await rows().count()).toBeGreaterThan(1);
	});
});

describe('an estimate page', () => {
	it('shows the chart, the line items, and moves the estimate by role', async () => {
		const e = made.h04;
		await page.goto(`${server.url}/estimates/${e.id}`);
		const canvas = page.getByTestId('price-chart');
		await canvas.waitFor();
		// chart.js has drawn: the doughnut leaves coloured pixels on the canvas.
		await page.waitForFunction(() => {
			const c = document.querySelector('[data-testid="price-chart"]') as HTMLCanvasElement;
			const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
			for (let i = 3; i < d.length; i += 4) if (d[i] > 0) return true;
			return false;
		});
		expect(await page.getByTestId('price-lines').getByTestId('line-item').count()).toBe(e.lines);
		const total = (e.totalCents / 100).toLocaleString('en-US', {
			style: 'currency',
			currency: 'USD'
		});
		expect(await page.getByTestId('estimate-total').innerText()).toBe(total);
		expect(await page.getByTestId('facet-table').locator('tbody tr').count()).toBe(7);
		expect(await page.getByText('Never mix it with acids or ammonia').count()).toBe(1);
		await page.screenshot({ path: 'screenshots/estimate-e2e-1280.png', fullPage: true });

		// An estimator may mark a draft ready, and has no further move after that.
		await page.getByRole('button', { name: 'Mark ready' }).click();
		await page.getByRole('status').filter({ hasText: 'Marked ready' }).waitFor();
		expect(await page.getByTestId('status-badge').first().innerText()).toBe('Ready');
		expect(await page.getByRole('button', { name: 'Mark sent' }).count()).toBe(0);
	});

	it('loads chart.js only on the estimate page', async () => {
		const scripts: string[] = [];
		page.on('response', (r) => r.url().includes('/_app/') && scripts.push(r.url()));
		await page.goto(`${server.url}/estimates`);
		await waitRows(4);
		const listScripts = [...scripts];
		const bodies = await Promise.all(
			listScripts
				.filter((u) => u.endsWith('.js'))
				.map(async (u) => (await page.request.get(u)).text())
		);
		expect(bodies.some((b) => b.includes('DoughnutController'))).toBe(false);
	});
});

describe('Estimates list, more than one page', () => {
	it('pages through links that keep the filters', async () => {
		// 19 more drafts of h05 make 21 on Alder Loop: two pages of 20.
		const site = prep.sites.find((s) => s.houseId === 'h05')!;
		for (let i = 0; i < 19; i++) {
			const res = await fetch(`${server.url}/api/estimates`, {
				method: 'POST',
				headers: { authorization: `Bearer ${prep.ownerToken}`, 'content-type': 'application/json' },
				body: JSON.stringify({ ...sceneRequest('h05'), siteId: site.id, save: true })
			});
			expect(res.status).toBe(201);
		}
		await page.goto(`${server.url}/estimates?text=alder`);
		await waitRows(20);
		expect(await page.getByTestId('estimates-count').innerText()).toBe('1–20 of 21');
		const next = page.getByRole('link', { name: 'Next' });
		expect(await next.getAttribute('href')).toBe('/estimates?text=alder&page=2');
		await next.click();
		await waitRows(1);
		expect(await page.getByTestId('estimates-count').innerText()).toBe('21–21 of 21');
		expect(new URL(page.url()).searchParams.get('text')).toBe('alder');
		expect(await page.getByRole('link', { name: 'Next' }).count()).toBe(0);
		// A page past the end goes to the last one.
		await page.goto(`${server.url}/estimates?text=alder&page=9`);
		await waitRows(1);
		expect(new URL(page.url()).searchParams.get('page')).toBe('2');
	});
});
