// A roof from its outline in Chromium: trace the outer edge of a sample-scene hip house corner by
// corner, choose the form and pitch, save the estimate, and check the stored sloped area against
// the scene's truth (geodata/scene.geojson, areas from GeographicLib).
import type { BrowserContext, Page } from 'playwright-core';
import type { Position } from 'geojson';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { facetsOf, house, type FacetFeature } from '../../geodata/scene';
import { openBrowser, signInAs } from '../helpers/browser';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let ctx: BrowserContext;
let page: Page;

beforeAll(async () => {
	server = await startServer(seededDataDir('e2e-footprint'));
	ctx = await openBrowser({ width: 1280, height: 900 });
	page = ctx.pages()[0] ?? (await ctx.newPage());
	await signInAs(page, server.url, DEMO.estimator);
});
afterAll(async () => {
	await ctx?.close();
	await server?.stop();
});

type Pt = [number, number];
const rel = (a: number, b: number) => Math.abs(a - b) / b;

/**
 * The house's outer edge: the facet segments no other facet shares (scene facets meet at the
 * very same vertices), chained into one ring, without corners on a straight run.
 */
function outerRing(facets: FacetFeature[]): Pt[] {
	const key = (p: Position) => `${p[0]},${p[1]}`;
	const segs = facets.flatMap((f) => {
		const r = f.geometry.coordinates[0];
		return r.slice(0, -1).map((p, i) => [p, r[i + 1]] as const);
	});
	const all = new Set(segs.map(([a, b]) => `${key(a)}>${key(b)}`));
	const outer = segs.filter(([a, b]) => !all.has(`${key(b)}>${key(a)}`));
	const next = new Map(outer.map(([a, b]) => [key(a), b]));
	const ring: Pt[] = [];
	let p = outer[0][0];
	do {
		ring.push([p[0], p[1]]);
		p = next.get(key(p))!;
	} while (key(p) !== key(ring[0]));
	return ring.filter((b, i) => {
		const a = ring[(i - 1 + ring.length) % ring.length];
		const c = ring[(i + 1) % ring.length];
		const cross = (b[0] - a[0]) * (c[1] - b[1]) - (b[1] - a[1]) * (c[0] - b[0]);
		return Math.abs(cross) > 1e-16;
	});
}

describe('a hip house measured from its outline', () => {
	// h04: a 5/12 clay-tile hip with a hip-ended garage wing: 8 corners, two valleys.
	const id = 'h04';
	const facets = facetsOf(id);
	const truth = house(id)!.properties;

	it('outline, roof form, pitch, Save estimate: the sloped area is within 0.5% of the truth', async () => {
		const r = await page.request.get(`${server.url}/api/sites`);
		const { sites } = (await r.json()) as { sites: { id: string; address: string }[] };
		const site = sites.find((s) => s.address === truth.address)!;
		expect(site).toBeDefined();
		await page.goto(`${server.url}/sites/${site.id}/roof`);
		await page.waitForFunction(() => window.__clearpitchMap?.kind === 'maplibre', null, {
			timeout: 30_000
		});

		// The demo already holds a measured plan for this house: clear it from the keyboard.
		const rows = page.locator('tbody tr[data-facet-row]');
		while ((await rows.count()) > 0) {
			const n = await rows.count();
			await rows.first().focus();
			await page.keyboard.press('Delete');
			await expect.poll(() => rows.count()).toBe(n - 1);
		}

		const ring = outerRing(facets);
		expect(ring).toHaveLength(8);
		const xs = ring.map((p) => p[0]);
		const ys = ring.map((p) => p[1]);
		await page.evaluate((b) => window.__clearpitchMap!.fitBounds(b, 80), [
			Math.min(...xs),
			Math.min(...ys),
			Math.max(...xs),
			Math.max(...ys)
		] as [number, number, number, number]);

		await page.getByTestId('trace-outline').click();
		await page.getByRole('button', { name: /Finish/ }).waitFor();
		for (const p of ring) {
			const s = await page.evaluate((c) => window.__clearpitchMap!.project(c), p);
			await page.mouse.move(s.x, s.y, { steps: 2 });
			await page.mouse.click(s.x, s.y);
		}
		await page.keyboard.press('Enter');

		const panel = page.getByTestId('roof-outline-panel');
		await panel.waitFor();
		// Hip is the form an outline starts with; the pitch is the house's 5/12.
		await expect.poll(() => panel.getByRole('radio', { name: 'Hip' }).isChecked()).toBe(true);
		await page.getByLabel('Pitch of every slope').selectOption('5');
		await expect.poll(() => rows.count()).toBe(facets.length);
		await page.getByTestId('outline-done').click();
		await expect(panel.count()).resolves.toBe(0);

		await page.getByRole('button', { name: 'Save estimate' }).click();
		const link = page.getByRole('link', { name: 'Open the saved estimate' });
		await link.waitFor({ timeout: 20_000 });

		const latest = await page.request.get(`${server.url}/api/sites/${site.id}/roof-plans/latest`);
		expect(latest.status()).toBe(200);
		const plan = (await latest.json()).plan as {
			facets: { pitch: number; edges: (string | null)[] }[];
			totals: { slopedAreaFt2: number };
		};
		expect(plan.facets).toHaveLength(facets.length);
		expect(plan.facets.every((f) => f.pitch === 5)).toBe(true);
		// The planes carry their edge names: two valleys, each shared by two facets.
		expect(plan.facets.flatMap((f) => f.edges).filter((e) => e === 'valley')).toHaveLength(4);
		// Truth: slopedAreaFt2 of h04 in geodata/scene.geojson (GeographicLib).
		expect(rel(plan.totals.slopedAreaFt2, truth.slopedAreaFt2)).toBeLessThan(0.005);

		const est = await page.request.get(`${server.url}/api${(await link.getAttribute('href'))!}`);
		expect(est.status()).toBe(200);
	});
});

describe('a gable house measured from its outline, gable ends tapped on the map', () => {
	// h01: a 6/12 shingle gable, 14 m × 9.6 m, gable walls on the short sides; no plan yet.
	const id = 'h01';
	const facets = facetsOf(id);
	const truth = house(id)!.properties;

	it('tap the two short sides on the map: two rectangles within 0.5% of the truth', async () => {
		const r = await page.request.get(`${server.url}/api/sites`);
		const { sites } = (await r.json()) as { sites: { id: string; address: string }[] };
		const site = sites.find((s) => s.address === truth.address)!;
		await page.goto(`${server.url}/sites/${site.id}/roof`);
		await page.waitForFunction(() => window.__clearpitchMap?.kind === 'maplibre', null, {
			timeout: 30_000
		});
		const rows = page.locator('tbody tr[data-facet-row]');
		expect(await rows.count()).toBe(0);

		const ring = outerRing(facets);
		expect(ring).toHaveLength(4);
		const xs = ring.map((p) => p[0]);
		const ys = ring.map((p) => p[1]);
		await page.evaluate((b) => window.__clearpitchMap!.fitBounds(b, 100), [
			Math.min(...xs),
			Math.min(...ys),
			Math.max(...xs),
			Math.max(...ys)
		] as [number, number, number, number]);
		await page.keyboard.press('o');
		await page.getByRole('button', { name: /Finish/ }).waitFor();
		for (const p of ring) {
			const s = await page.evaluate((c) => window.__clearpitchMap!.project(c), p);
			await page.mouse.move(s.x, s.y, { steps: 2 });
			await page.mouse.click(s.x, s.y);
		}
		await page.keyboard.press('Enter');
		await page.getByTestId('roof-outline-panel').waitFor();
		await expect.poll(() => rows.count()).toBe(4);

		// The short sides, by their length on screen (plan lengths scale alike at one zoom).
		const px = await Promise.all(
			ring.map((p) => page.evaluate((c) => window.__clearpitchMap!.project(c), p))
		);
		const len = (i: number) => {
			const a = px[i];
			const b = px[(i + 1) % px.length];
			return Math.hypot(b.x - a.x, b.y - a.y);
		};
		const short = [0, 1, 2, 3].filter((i) => len(i) < len((i + 1) % 4));
		expect(short).toHaveLength(2);
		const buttons = page.locator('.cp-side-button');
		expect(await buttons.count()).toBe(4);
		for (const i of short) await buttons.nth(i).click();
		await expect.poll(() => rows.count()).toBe(2);
		await page.getByLabel('Pitch of every slope').selectOption('6');
		await page.getByTestId('outline-done').click();

		await page.getByTestId('save-plan').click();
		await expect
			.poll(() => page.getByTestId('save-status').innerText())
			.toMatch(/Saved as version 1/);
		const latest = await page.request.get(`${server.url}/api/sites/${site.id}/roof-plans/latest`);
		const plan = (await latest.json()).plan as {
			facets: { pitch: number; edges: (string | null)[] }[];
			totals: { slopedAreaFt2: number };
		};
		expect(plan.facets).toHaveLength(2);
		for (const f of plan.facets)
			expect([...f.edges].sort()).toEqual(['eave', 'rake', 'rake', 'ridge']);
		// Truth: slopedAreaFt2 of h01 in geodata/scene.geojson (GeographicLib).
		expect(rel(plan.totals.slopedAreaFt2, truth.slopedAreaFt2)).toBeLessThan(0.005);
	});
});
