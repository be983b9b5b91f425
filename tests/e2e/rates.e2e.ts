// The Rates page in Chromium: the preview moves while the owner types, a save makes version 2,
// and a bad figure gets a field error and makes no version.
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, signInAs } from '../helpers/browser';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let ctx: BrowserContext;
let page: Page;

const ASPHALT = '#rate-materials-asphalt_shingle-perSquareCents';

beforeAll(async () => {
	server = await startServer(seededDataDir('e2e-rates'));
	ctx = await openBrowser({ width: 1280, height: 900 });
	page = ctx.pages()[0] ?? (await ctx.newPage());
	await signInAs(page, server.url, DEMO.owner);
});
afterAll(async () => {
	await ctx?.close();
	await server?.stop();
});

const previewTotals = () => page.getByTestId('preview-edited').allInnerTexts();
const versions = async () => {
	const r = await page.request.get(`${server.url}/api/rate-cards`);
	return ((await r.json()).items as { version: number }[]).map((v) => v.version);
};

describe('Rates', () => {
	it('moves the preview as the owner types, then saves version 2', async () => {
		await page.goto(`${server.url}/rates`);
		await page.locator(ASPHALT).waitFor();
		expect(await page.locator(ASPHALT).inputValue()).toBe('32.00');
		const before = await previewTotals();
		expect(before).toHaveLength(3);
		expect(await page.getByTestId('rate-version').count()).toBe(1);

		await page.locator(ASPHALT).fill('40.00');
		// The first sample roof is all asphalt shingle: its price must rise, before any save.
		await page.waitForFunction(
			(old) =>
				document.querySelector('[data-testid="preview-edited"]')?.textContent?.trim() !== old,
			before[0]
		);
		const after = await previewTotals();
		const dollars = (s: string) => Number(s.replace(/[^0-9.]/g, ''));
		expect(dollars(after[0])).toBeGreaterThan(dollars(before[0]));
		expect(await page.getByTestId('preview-delta').first().innerText()).toMatch(/^\+\$/);
		expect(await versions()).toEqual([1]);
		await page.screenshot({ path: 'screenshots/rates-preview-1280.png', fullPage: false });

		await page.getByLabel('What changed (optional)').fill('Shingle rate up for spring');
		await page.getByRole('button', { name: 'Save as version 2' }).click();
		await page.getByRole('status').filter({ hasText: 'Saved as version 2' }).waitFor();
		const rows = page.getByTestId('rate-version');
		expect(await rows.count()).toBe(2);
		expect(await rows.first().innerText()).toMatch(/v2/);
		expect(await rows.first().innerText()).toMatch(/Shingle rate up for spring/);
		expect(await rows.first().innerText()).toMatch(/\$32\.00\s*→\s*\$40\.00/);
		expect(await page.locator(ASPHALT).inputValue()).toBe('40.00');
		expect(await versions()).toEqual([2, 1]);
	});

	it('shows a field error for a bad figure and makes no version', async () => {
		await page.goto(`${server.url}/rates`);
		await page.locator(ASPHALT).fill('-5');
		const fieldError = page.locator(`${ASPHALT}-error`);
		await fieldError.waitFor();
		expect(await fieldError.innerText()).toMatch(/at least \$0\.00/i);
		expect(await page.locator(ASPHALT).getAttribute('aria-invalid')).toBe('true');
		const answered = page.waitForResponse((r) => r.url().includes('/rates?/save'));
		await page.getByRole('button', { name: 'Save as version 3' }).click();
		// use:enhance receives the action's answer as JSON: a failure with status 400.
		expect(await (await answered).json()).toMatchObject({ type: 'failure', status: 400 });
		await page.getByRole('alert').filter({ hasText: 'Nothing was saved' }).waitFor();
		expect(await fieldError.innerText()).toMatch(/at least/i);
		expect(await page.getByTestId('rate-version').count()).toBe(2);
		expect(await versions()).toEqual([2, 1]);

		await page.locator(ASPHALT).fill('forty');
		expect(await page.locator(`${ASPHALT}-error`).innerText()).toMatch(/Enter an amount/);
		const again = page.waitForResponse((r) => r.url().includes('/rates?/save'));
		await page.getByRole('button', { name: 'Save as version 3' }).click();
		expect(await (await again).json()).toMatchObject({ type: 'failure', status: 400 });
		await page.getByRole('alert').filter({ hasText: 'Nothing was saved' }).waitFor();
		expect(await versions()).toEqual([2, 1]);
	});
});
