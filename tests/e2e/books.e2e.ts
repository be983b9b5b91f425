// The owner's books in Debian's Chromium against the built server: every report draws its chart
// with its table and downloads its CSV; on a company with no work yet each report shows its
// empty state; the import previews a file, names its bad rows, keeps Import off until a clean
// preview, then imports. Screenshots of each report go to tmp/screenshots/books/ for review.
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, signInAs } from '../helpers/browser';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { REPORT_IDS } from '../../src/lib/reports/tables';

const SHOTS = path.resolve('tmp/screenshots/books');
let demo: TestServer;
let empty: TestServer;
let ctx: BrowserContext;
let page: Page;

/** A data dir with the demo's samples: estimates at every stage, jobs scheduled, done and paid. */
function sampleDataDir(): string {
	const dir = path.resolve('tmp', 'data', `books-e2e-${process.pid}-${Date.now()}`);
	execFileSync('npx', ['tsx', 'scripts/seed.ts'], {
		env: { ...process.env, CLEARPITCH_DATA_DIR: dir, DATABASE_URL: '' },
		stdio: 'pipe'
	});
	return dir;
}

beforeAll(async () => {
	fs.mkdirSync(SHOTS, { recursive: true });
	demo = await startServer(sampleDataDir());
	empty = await startServer(seededDataDir('books-e2e-empty'));
	ctx = await openBrowser({ width: 1280, height: 900, webgl: false });
	page = ctx.pages()[0] ?? (await ctx.newPage());
}, 300_000);
afterAll(async () => {
	await ctx?.close();
	await demo?.stop();
	await empty?.stop();
});

/** How many pixels of a canvas are not blank: a drawn chart has many. */
const inked = (p: Page, id: string) =>
	p.locator(`[data-testid=report-${id}] canvas`).evaluate((c: HTMLCanvasElement) => {
		const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
		let n = 0;
		for (let i = 3; i < d.length; i += 4) if (d[i] > 0) n++;
		return n;
	});

describe('reports', () => {
	it('draws each report with its table and CSV, from the demo sample jobs', async () => {
		await signInAs(page, demo.url, DEMO.owner);
		const scripts: string[] = [];
		page.on('response', (r) => r.url().endsWith('.js') && scripts.push(r.url()));
		await page.goto(`${demo.url}/reports`);
		await page.waitForLoadState('networkidle');
		for (const id of REPORT_IDS) {
			const section = page.getByTestId(`report-${id}`);
			await expect.poll(() => inked(page, id), { timeout: 10_000 }).toBeGreaterThan(2000);
			expect(
				await section.getByTestId(`report-table-${id}`).locator('tbody tr').count()
			).toBeGreaterThan(0);
			const [download] = await Promise.all([
				page.waitForEvent('download'),
				section.getByRole('link', { name: /Download CSV/ }).click()
			]);
			const file = await download.path();
			const text = fs.readFileSync(file!, 'utf8');
			expect(text.charCodeAt(0), id).toBe(0xfeff);
			const head = await section.locator('thead th').allInnerTexts();
			expect(text.slice(1).split('\r\n')[0].toLowerCase(), id).toBe(
				head.map((h) => h.trim().toLowerCase()).join(',')
			);
			await section.screenshot({ path: path.join(SHOTS, `${id}.png`) });
		}
		await page.screenshot({ path: path.join(SHOTS, 'reports-1280.png'), fullPage: true });
		// The done and paid sample jobs have their stock and hours logged.
		const hours = await page.getByTestId('report-table-crew-hours').locator('tbody tr').count();
		expect(hours).toBe(2);
		await page.setViewportSize({ width: 390, height: 844 });
		await page.screenshot({ path: path.join(SHOTS, 'reports-390.png'), fullPage: true });
		await page.setViewportSize({ width: 1280, height: 900 });
	});

	it('shows an empty state for each report of a company with no work yet', async () => {
		await ctx.clearCookies();
		await signInAs(page, empty.url, DEMO.owner);
		await page.goto(`${empty.url}/reports`);
		for (const id of REPORT_IDS) {
			const section = page.getByTestId(`report-${id}`);
			await expect.poll(() => section.getByText('Nothing to show yet').count()).toBe(1);
			expect(await section.locator('canvas').count()).toBe(0);
			expect(await section.getByRole('link', { name: /Download CSV/ }).count()).toBe(0);
		}
		await page.screenshot({ path: path.join(SHOTS, 'reports-empty.png'), fullPage: true });
	});
});

describe('import', () => {
	const HEADER = 'customer_ref,name,email,phone,notes';
	const SITES =
		'site_ref,customer_ref,address,lat,lon,notes,gate_code,pets,water_source,no_gutters,plants_to_protect,pool,power_line\r\n' +
		',k1,21 Kestrel Yard,35.5201,-74.4611,,,,,no,yes,,';
	const file = (name: string, text: string) => ({
		name,
		mimeType: 'text/csv',
		buffer: Buffer.from(text)
	});

	it('previews, names the bad row, and imports only after a clean preview', async () => {
		await page.goto(`${empty.url}/data`);
		const importButton = page.getByRole('button', { name: /^Import/ });
		expect(await importButton.isDisabled()).toBe(true);
		await page
			.getByLabel('Customers file (CSV)')
			.setInputFiles(
				file(
					'customers.csv',
					`${HEADER}\r\nk1,Odile Brackenridge,,,\r\nk2,Piers Fallow,not-an-email,,`
				)
			);
		await page.getByLabel('Sites file (CSV)').setInputFiles(file('sites.csv', SITES));
		await page.getByRole('button', { name: 'Preview' }).click();
		const problems = page.getByTestId('import-problems');
		await problems.waitFor();
		expect(await problems.innerText()).toMatch(
			/customers\s+3\s+email\s+Enter a valid e-mail address/
		);
		expect(await importButton.isDisabled()).toBe(true);
		await page.screenshot({ path: path.join(SHOTS, 'import-problems.png'), fullPage: true });

		await page
			.getByLabel('Customers file (CSV)')
			.setInputFiles(
				file(
					'customers.csv',
					`${HEADER}\r\nk1,Odile Brackenridge,,,\r\nk2,Piers Fallow,piers@wrenfield.example,+1 555 0100,`
				)
			);
		await page.getByRole('button', { name: 'Preview' }).click();
		await page.getByTestId('import-preview').waitFor();
		await expect.poll(() => page.getByTestId('import-problems').count()).toBe(0);
		await expect.poll(() => importButton.innerText()).toMatch(/Import 2 customers and\s+1 site/);
		await page.screenshot({ path: path.join(SHOTS, 'import-preview.png'), fullPage: true });
		await importButton.click();
		await page
			.getByRole('status')
			.filter({ hasText: 'Imported 2 customers and 1 site.' })
			.waitFor();

		await page.goto(`${empty.url}/sites?q=Kestrel`);
		expect(await page.getByText('21 Kestrel Yard').count()).toBeGreaterThan(0);
	});
});
