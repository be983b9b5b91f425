// The site visit on a phone-sized screen (390 px, touch), in Chromium against the built server:
// open the visit from the estimate, start it, correct a facet, add a photo through the file
// input (a small JPEG made with sharp, carrying a GPS position), see its thumbnail and its marker
// on the map, mark it for the proposal, then confirm and see the estimate ready and re-priced.
import path from 'node:path';
import fs from 'node:fs';
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { planFacetsOf } from '../../geodata/scene';
import { openBrowser, signInAs } from '../helpers/browser';
import { createWithToken } from '../helpers/http';
import { jpegWithGps } from '../helpers/photo-fixtures';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { prepareDataDir } from '../integration/api-helpers';

let server: TestServer;
let ctx: BrowserContext;
let page: Page;
let estimateId = '';
let photoFile = '';

beforeAll(async () => {
	const dir = seededDataDir('e2e-site-visit');
	const prep = await prepareDataDir(dir);
	server = await startServer(dir);
	const site = prep.sites.find((s) => s.houseId === 'h03')!;
	type Created = { plan: { id: string }; estimate: { id: string } };
	const plan = (
		await createWithToken<Created>(server.url, prep.ownerToken, '/api/roof-plans', {
			siteId: site.id,
			facets: planFacetsOf('h03'),
			baseVersion: null
		})
	).plan;
	estimateId = (
		await createWithToken<Created>(server.url, prep.ownerToken, '/api/estimates', {
			roofPlanId: plan.id,
			siteId: site.id,
			save: true
		})
	).estimate.id;
	photoFile = path.resolve('tmp', `e2e-visit-${process.pid}`, 'front slope.jpg');
	fs.mkdirSync(path.dirname(photoFile), { recursive: true });
	// Taken at the first corner of the house's first facet, so its marker lands on the map.
	const [lon, lat] = planFacetsOf('h03')[0].geometry.coordinates[0][0];
	fs.writeFileSync(photoFile, await jpegWithGps(800, 600, '#55704a', { lat, lon }));
	ctx = await openBrowser({ width: 390, height: 844, webgl: false });
	page = ctx.pages()[0] ?? (await ctx.newPage());
	await signInAs(page, server.url, DEMO.sales);
});
afterAll(async () => {
	await ctx?.close();
	await server?.stop();
	if (photoFile) fs.rmSync(path.dirname(photoFile), { recursive: true, force: true });
});

describe('site visit at 390 px', () => {
	it('opens the visit from the estimate and starts it', async () => {
		await page.goto(`${server.url}/estimates/${estimateId}`);
		await page.getByRole('link', { name: 'Site visit' }).click();
		await page.waitForURL(`${server.url}/estimates/${estimateId}/visit`);
		await page.getByRole('button', { name: 'Start the site visit' }).click();
		await page.getByTestId('visit-facet').first().waitFor();
		expect(await page.getByTestId('visit-facet').count()).toBe(planFacetsOf('h03').length);
		// Nothing wider than the screen.
		expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
			390
		);
	});

	it('corrects a facet with touch-sized controls', async () => {
		const facet = page.getByTestId('visit-facet').first();
		const preset = facet.getByRole('button', { name: 'Pitch 10/12' });
		const box = await preset.boundingBox();
		expect(box!.height).toBeGreaterThanOrEqual(44);
		expect(box!.width).toBeGreaterThanOrEqual(44);
		await preset.click();
		await facet.getByText('G3', { exact: true }).click();
		await facet.getByRole('button', { name: 'Checked on site' }).click();
		await facet.getByText('Corrected: pitch, growth').waitFor();
	});

	it('uploads a photo with a progress bar, shows its thumbnail and its position on the map', async () => {
		await page.getByTestId('photo-files').setInputFiles(photoFile);
		const upload = page.getByTestId('uploads').locator('li').first();
		await upload.locator('progress').waitFor();
		await page.waitForSelector('[data-testid="uploads"] li[data-state="done"]');
		const thumb = page.getByRole('img', { name: 'Photo front slope.jpg' });
		await thumb.waitFor();
		await page.waitForFunction(
			() =>
				(document.querySelector('img[alt="Photo front slope.jpg"]') as HTMLImageElement | null)
					?.naturalWidth === 320
		);
		await page.waitForSelector('.cp-photo-marker');
		expect(await page.locator('.cp-photo-marker').count()).toBe(1);
		expect(await upload.innerText()).toContain('added');
		await page.getByRole('button', { name: 'Show on proposal' }).click();
		await page.getByRole('button', { name: '✓ On proposal' }).waitFor();
	});

	it('confirms the visit: the estimate is ready with the range confirmed on site', async () => {
		await page.getByRole('button', { name: 'Confirm visit and re-price' }).click();
		await page.getByTestId('visit-confirmed').waitFor();
		expect(await page.getByTestId('status-badge').innerText()).toMatch(/ready/i);
		await page.getByRole('link', { name: '← Estimate' }).click();
		await page.waitForURL(`${server.url}/estimates/${estimateId}`);
		await page.getByText('(confirmed on site)').waitFor();
		expect(await page.getByTestId('status-badge').innerText()).toMatch(/ready/i);
	});
});
