// The owner's calibration of growth suggestions in Chromium: six facets graded on a confirmed
// site visit, the Calibrate button on Settings, the agreement before → after and the new cuts
// on screen. The expected figures are counted by hand below.
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { houses, planFacetsOf } from '../../geodata/scene';
import { growthScore, suggestGrade } from '../../src/lib/estimating/growth-suggest';
import { openBrowser, signInAs } from '../helpers/browser';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let ctx: BrowserContext;
let page: Page;

// h04's seven facets: imagery score and the grade found on site (rising with the score). With
// the default cuts [0.003, 0.026, 0.56, 1.57] the suggestions are G2 G2 G3 G3 G3 G3 G4: exact on
// 0.3 (G2), 1.2 and 1.5 (G3) and 2.0 (G4), so 4 of 7 before; the fit puts all 7 in their grade.
const SCORES = [0.1, 0.3, 0.7, 0.8, 1.2, 1.5, 2.0];
const SITE = ['G1', 'G2', 'G2', 'G2', 'G3', 'G3', 'G4'];

function suggestion(score: number) {
	const measures = { streakShare: 0, heavyShare: 0, contrast: score / 4 };
	const m = { pixels: 4000, cleanLevel: 150, ...measures, score: growthScore(measures) };
	return { ...suggestGrade(m), measures: m };
}

beforeAll(async () => {
	server = await startServer(seededDataDir('e2e-growth-calibration'));
	ctx = await openBrowser({ width: 1280, height: 1400 });
	page = ctx.pages()[0] ?? (await ctx.newPage());
	await signInAs(page, server.url, DEMO.owner);
});
afterAll(async () => {
	await ctx?.close();
	await server?.stop();
});

async function action(path: string, fields: Record<string, string>) {
	const r = await page.request.post(server.url + path, {
		form: fields,
		headers: { origin: server.url, accept: 'application/json', 'x-sveltekit-action': 'true' }
	});
	const body = (await r.json()) as { type: string; status?: number };
	expect(body.type, `${path}: ${JSON.stringify(body)}`).toBe('success');
}

describe('calibrating growth suggestions on Settings', () => {
	it('calibrates on the site-visit grades and shows the agreement and the new cuts', async () => {
		const { sites } = (await (await page.request.get(`${server.url}/api/sites`)).json()) as {
			sites: { id: string; address: string }[];
		};
		const address = houses().find((h) => h.properties.houseId === 'h04')!.properties.address;
		const site = sites.find((s) => s.address === address)!;
		const facets = planFacetsOf('h04');
		expect(facets).toHaveLength(SCORES.length);
		const saved = await page.request.post(`${server.url}/api/roof-plans`, {
			data: {
				siteId: site.id,
				facets: facets.map((f, i) => ({ ...f, growthSuggestion: suggestion(SCORES[i]) })),
				baseVersion: null
			},
			headers: { origin: server.url }
		});
		expect(saved.status(), await saved.text()).toBe(201);
		const plan = ((await saved.json()) as { plan: { id: string } }).plan;
		const priced = await page.request.post(`${server.url}/api/estimates`, {
			data: { roofPlanId: plan.id, siteId: site.id, save: true },
			headers: { origin: server.url }
		});
		expect(priced.status(), await priced.text()).toBe(201);
		const estimateId = ((await priced.json()) as { estimate: { id: string } }).estimate.id;
		const visit = `/estimates/${estimateId}/visit`;
		await action(`${visit}?/start`, {});
		for (const [i, f] of facets.entries()) {
			await action(`${visit}?/facet`, {
				facetId: f.id,
				pitch: String(f.pitch),
				material: f.material,
				growth: SITE[i],
				access: f.access,
				stories: String(f.stories)
			});
		}
		await action(`${visit}?/confirm`, {});

		await page.goto(`${server.url}/settings`);
		const section = page.getByTestId('growth-calibration');
		expect(await section.getByTestId('growth-available').textContent()).toMatch(/^\s*7 graded/);
		await section.getByRole('button', { name: 'Calibrate growth suggestions' }).click();
		const status = section.getByRole('status');
		await status.waitFor();
		expect(await status.textContent()).toContain(
			'Calibrated on 7 site-visit facets: the suggestion matches the site grade on 4 of 7 before and 7 of 7 now'
		);
		// Each cut midway between the grades' neighbouring facets: G1|G2 (0.1+0.3)/2 = 0.2,
		// G2|G3 (0.8+1.2)/2 = 1, G3|G4 (1.5+2.0)/2 = 1.75; G0|G1 keeps the default (no G0 facet).
		const bands = await section
			.getByTestId('growth-bands')
			.locator('tbody tr')
			.evaluateAll((rows) =>
				rows.map((r) =>
					[...(r as HTMLTableRowElement).cells].map((c) => c.textContent?.trim()).join(' ')
				)
			);
		expect(bands).toEqual([
			'G0 clean — 0.003',
			'G1 light 0.003 0.2',
			'G2 moderate 0.2 1',
			'G3 heavy 1 1.75',
			'G4 severe 1.75 —'
		]);
		expect(await section.getByTestId('growth-cuts-source').textContent()).toMatch(
			/Calibrated .* on 7 site-visit facets: matched 4 → 7 of 7/
		);
		await section.screenshot({ path: '/work/shots/calibrate.png' });
	}, 120_000);
});
