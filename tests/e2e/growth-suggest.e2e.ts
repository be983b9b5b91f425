// The growth suggestion in Chromium: the editor reads the sample tiles under a scene facet,
// suggests a grade, the estimator accepts it, and the saved plan keeps both the suggestion and
// the grade chosen. The scene's true grade (geodata/scene.geojson) is the reference.
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { facetsOf, house } from '../../geodata/scene';
import { openBrowser, signInAs } from '../helpers/browser';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let ctx: BrowserContext;
let page: Page;

beforeAll(async () => {
	server = await startServer(seededDataDir('e2e-growth-suggest'));
	ctx = await openBrowser({ width: 1280, height: 900 });
	page = ctx.pages()[0] ?? (await ctx.newPage());
	await signInAs(page, server.url, DEMO.estimator);
});
afterAll(async () => {
	await ctx?.close();
	await server?.stop();
});

const GRADES = ['G0', 'G1', 'G2', 'G3', 'G4'];

describe('growth grade suggested in the facet panel', () => {
	it('shows a suggestion, accepts it, and the saved plan stores suggested and chosen', async () => {
		const truth = house('h04')!.properties;
		const r = await page.request.get(`${server.url}/api/sites`);
		const { sites } = (await r.json()) as { sites: { id: string; address: string }[] };
		const site = sites.find((s) => s.address === truth.address)!;
		expect(site).toBeDefined();
		// A first plan from the scene's true outlines, every facet graded G0 so the suggestion
		// has something to change.
		const facets = facetsOf('h04').map((f) => ({
			id: f.properties.facetId,
			label: f.properties.label,
			geometry: f.geometry,
			pitch: f.properties.pitch,
			material: f.properties.material,
			growth: 'G0',
			access: f.properties.access,
			stories: f.properties.stories,
			edges: f.properties.edges
		}));
		const saved = await page.request.post(`${server.url}/api/roof-plans`, {
			data: { siteId: site.id, facets, baseVersion: null },
			headers: { origin: server.url }
		});
		expect(saved.status(), await saved.text()).toBe(201);
		await page.goto(`${server.url}/sites/${site.id}/roof`);
		await page.waitForFunction(() => window.__clearpitchMap?.kind === 'maplibre', null, {
			timeout: 30_000
		});
		const row = page.locator('tbody tr[data-facet-row]').first();
		const facetId = await row.getAttribute('data-facet-row');
		// Focus selects the row (a click in its middle would land on a select).
		await row.focus();
		const shown = page.getByTestId('growth-suggestion');
		await page.locator('[data-testid^="growth-suggestion"]').waitFor({ timeout: 20_000 });
		expect(await page.getByTestId('growth-suggestion-none').count()).toBe(0);
		const text = (await shown.textContent()) ?? '';
		const m = /Suggested:\s*(G[0-4])\s*\(confidence (\d+)%\)/.exec(text.replace(/\s+/g, ' '));
		expect(m, text).not.toBeNull();
		const suggested = m![1];
		expect(Number(m![2])).toBeGreaterThanOrEqual(50);

		await page
			.locator('section[aria-labelledby="facet-heading"]')
			.screenshot({ path: '/work/shots/growth-panel.png' });

		// Move the grade away first, so Accept visibly changes it back to the suggestion.
		const other = GRADES.find((g) => g !== suggested)!;
		await page.locator(`input[name="growth"][value="${other}"]`).check({ force: true });
		await page.getByRole('button', { name: `Accept ${suggested}` }).click({ timeout: 10_000 });
		await expect
			.poll(() => page.locator('input[name="growth"]:checked').getAttribute('value'))
			.toBe(suggested);
		const save = page.getByTestId('save-plan');
		await page.waitForTimeout(1000);
		if (await save.isEnabled()) await save.click();

		await expect
			.poll(
				async () => {
					const res = await page.request.get(
						`${server.url}/api/sites/${site.id}/roof-plans/latest`
					);
					const plan = (await res.json()).plan as {
						facets: { id: string; growth: string; growthSuggestion?: { grade: string } }[];
					};
					const f = plan.facets.find((x) => x.id === facetId);
					return f ? `${f.growth}/${f.growthSuggestion?.grade ?? '-'}` : 'missing';
				},
				{ timeout: 15_000 }
			)
			.toBe(`${suggested}/${suggested}`);
	}, 90_000);
});
