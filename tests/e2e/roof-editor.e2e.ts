// The roof-plan editor in Chromium: trace a sample-scene house by its true corners, save, and
// check the stored sloped area against the scene's truth; edit a corner; keyboard; versions;
// the Leaflet fallback without WebGL. Truth: geodata/scene.geojson (areas from GeographicLib).
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { facetsOf, house, type FacetFeature } from '../../geodata/scene';
import { openBrowser, signInAs } from '../helpers/browser';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { FT2_PER_M2, Geodesic, geodesicAreaM2 } from '../unit/map/reference';

let server: TestServer;
let ctx: BrowserContext;
let page: Page;

beforeAll(async () => {
	server = await startServer(seededDataDir('e2e-roof'));
	ctx = await openBrowser({ width: 1280, height: 900 });
	page = ctx.pages()[0] ?? (await ctx.newPage());
	await signInAs(page, server.url, DEMO.estimator);
});
afterAll(async () => {
	await ctx?.close();
	await server?.stop();
});

async function siteOf(p: Page, houseId: string): Promise<string> {
	const r = await p.request.get(`${server.url}/api/sites`);
	const { sites } = (await r.json()) as { sites: { id: string; address: string }[] };
	// The seed puts a scene house's site at the house's address.
	const s = sites.find((x) => x.address === house(houseId)?.properties.address);
	if (!s) throw new Error(`no demo site for ${houseId}`);
	return s.id;
}

type Pt = [number, number];
const bboxOf = (facets: FacetFeature[]): [number, number, number, number] => {
	const pts = facets.flatMap((f) => f.geometry.coordinates[0]);
	const xs = pts.map((p) => p[0]);
	const ys = pts.map((p) => p[1]);
	return [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)];
};

async function openEditor(p: Page, siteId: string, kind: 'maplibre' | 'leaflet') {
	await p.goto(`${server.url}/sites/${siteId}/roof`);
	await p.waitForFunction((k) => window.__clearpitchMap?.kind === k, kind, { timeout: 30_000 });
}

const screen = (p: Page, lonLat: Pt) =>
	p.evaluate((c) => window.__clearpitchMap!.project(c), lonLat);

/** Fits the view to the facets; the handle's promise resolves once the map has settled. */
async function fit(p: Page, facets: FacetFeature[], padding = 120) {
	await p.evaluate(([b, pad]) => window.__clearpitchMap!.fitBounds(b, pad), [
		bboxOf(facets),
		padding
	] as const);
}

/** Draws one facet by clicking its corners, as a person would, and finishes with Enter. */
async function drawFacet(p: Page, ring: Pt[], offsetPx: (i: number) => Pt = () => [0, 0]) {
	const rows = p.locator('tbody tr[data-facet-row]');
	const before = await rows.count();
	await p.getByTestId('draw-facet').click();
	// In draw mode the toolbar offers Finish in place of Draw facet.
	await p.getByRole('button', { name: /Finish/ }).waitFor();
	for (let i = 0; i < ring.length; i++) {
		const s = await screen(p, ring[i]);
		const [dx, dy] = offsetPx(i);
		await p.mouse.move(s.x + dx, s.y + dy, { steps: 2 });
		await p.mouse.click(s.x + dx, s.y + dy);
	}
	await p.keyboard.press('Enter');
	// The facet is committed: one more row in the table, and the editor is back to browsing.
	await expect.poll(() => rows.count()).toBe(before + 1);
	await p.getByTestId('draw-facet').waitFor();
}

async function latestPlan(p: Page, siteId: string) {
	const r = await p.request.get(`${server.url}/api/sites/${siteId}/roof-plans/latest`);
	expect(r.status()).toBe(200);
	return (await r.json()).plan as {
		id: string;
		version: number;
		source: string;
		facets: {
			id: string;
			geometry: { coordinates: number[][][] };
			pitch: number;
			material: string;
		}[];
		measures: { ok: boolean; slopedAreaFt2: number; planAreaFt2: number }[];
		totals: { slopedAreaFt2: number; planAreaFt2: number; squares: number };
	};
}

const rel = (a: number, b: number) => Math.abs(a - b) / b;
const pitchFactor = (rise: number) => Math.sqrt(1 + (rise / 12) ** 2);

describe('tracing a house in the MapLibre editor', () => {
	// h03: an L-shaped cross-gable, four facets meeting at ridges and valleys, 8/12 shingle.
	const truth = house('h03')!.properties;
	const facets = facetsOf('h03');
	let siteId: string;

	it('draws the true corners, sets pitch and material in the table, and saves within 1% of the scene', async () => {
		siteId = await siteOf(page, 'h03');
		await openEditor(page, siteId, 'maplibre');
		// Zoomed to each facet in turn, as a person tracing a small wing would.
		for (const f of facets) {
			await fit(page, [f], 100);
			await drawFacet(page, f.geometry.coordinates[0].slice(0, -1) as Pt[]);
		}
		await fit(page, facets);

		const rows = page.locator('tbody tr[data-facet-row]');
		expect(await rows.count()).toBe(facets.length);
		for (let i = 0; i < facets.length; i++) {
			await page
				.getByLabel(`Pitch of Facet ${i + 1}`)
				.selectOption(String(facets[i].properties.pitch));
			await page
				.getByLabel(`Material of Facet ${i + 1}`)
				.selectOption(facets[i].properties.material);
			await page
				.getByLabel(`Growth grade of Facet ${i + 1}`)
				.selectOption(facets[i].properties.growth);
		}
		// The live total on screen already agrees with the truth.
		const shown = Number(
			(await page.getByTestId('total-sloped').innerText()).replace(/[^\d.]/g, '')
		);
		expect(rel(shown, truth.slopedAreaFt2)).toBeLessThan(0.01);

		await page.getByTestId('save-plan').click();
		await expect
			.poll(() => page.getByTestId('save-status').innerText())
			.toMatch(/Saved as version 1/);

		const plan = await latestPlan(page, siteId);
		expect(plan.version).toBe(1);
		expect(plan.facets).toHaveLength(4);
		// Source of truth: slopedAreaFt2 of house h03 in geodata/scene.geojson (GeographicLib).
		expect(rel(plan.totals.slopedAreaFt2, truth.slopedAreaFt2)).toBeLessThan(0.01);
		expect(rel(plan.totals.planAreaFt2, truth.planAreaFt2)).toBeLessThan(0.01);
		plan.facets.forEach((f, i) => {
			expect(f.pitch).toBe(facets[i].properties.pitch);
			expect(f.material).toBe(facets[i].properties.material);
			expect(rel(plan.measures[i].slopedAreaFt2, facets[i].properties.slopedAreaFt2)).toBeLessThan(
				0.01
			);
		});
	});

	it('prices the plan from the rates as it is edited, and saves the estimate', async () => {
		await expect
			.poll(() => page.getByTestId('price-total').innerText(), { timeout: 10_000 })
			.toMatch(/^\$[\d,]+$/);
		await page.getByRole('button', { name: 'Save estimate' }).click();
		const link = page.getByRole('link', { name: 'Open the saved estimate' });
		await link.waitFor();
		const href = (await link.getAttribute('href'))!;
		expect(href).toMatch(/^\/estimates\/[0-9a-f-]{36}$/);
		const est = await page.request.get(`${server.url}/api${href}`);
		expect(est.status()).toBe(200);
		// the saved estimate points at the saved roof plan version
		const plan = await latestPlan(page, siteId);
		expect(JSON.stringify(await est.json())).toContain(plan.id);
	});

	it('shows areas in m² when asked, converted exactly (NIST: 1 ft² = 0.09290304 m²)', async () => {
		const num = async () =>
			Number((await page.getByTestId('total-sloped').innerText()).replace(/[^\d.]/g, ''));
		const ft2 = await num();
		await page.getByRole('button', { name: 'm²' }).click();
		expect(await page.getByTestId('total-sloped').innerText()).toMatch(/m²$/);
		// ft² is shown whole, m² to 0.1: allow the display rounding of both
		expect(Math.abs((await num()) - ft2 * 0.09290304)).toBeLessThan(0.1);
		await page.getByRole('button', { name: 'ft²' }).click();
		expect(await page.getByTestId('total-sloped').innerText()).toMatch(/ft²$/);
	});

	it('moves one corner to a new true position and saves a version 2 that matches its geometry', async () => {
		// The south slope's south-east (eave) corner, moved 1.5 m east along the eave line.
		const ring = facets[0].geometry.coordinates[0] as Pt[];
		const k = ring.findIndex(
			(p, i) =>
				i < ring.length - 1 &&
				p[0] === Math.max(...ring.map((q) => q[0])) &&
				p[1] === Math.min(...ring.map((q) => q[1]))
		);
		const from = ring[k];
		const to = Geodesic.WGS84.Direct(from[1], from[0], 90, 1.5);
		const target: Pt = [to.lon2!, to.lat2!];

		const row0 = page.locator('tbody tr[data-facet-row]').nth(0);
		// The table shows committed areas only: it changes when the dragged corner is committed.
		const areaBefore = await row0.getByTestId('facet-sloped').innerText();
		await row0.locator('td').first().click();
		await page.getByRole('button', { name: 'Corners' }).click();
		await expect
			.poll(() => page.getByRole('button', { name: 'Corners' }).getAttribute('aria-pressed'))
			.toBe('true');
		const a = await screen(page, from);
		const b = await screen(page, target);
		await page.mouse.move(a.x, a.y);
		await page.mouse.down();
		await page.mouse.move((a.x + b.x) / 2, (a.y + b.y) / 2, { steps: 4 });
		await page.mouse.move(b.x, b.y, { steps: 4 });
		await page.mouse.up();
		await expect.poll(() => row0.getByTestId('facet-sloped').innerText()).not.toBe(areaBefore);
		await page.getByTestId('save-plan').click();
		await expect
			.poll(() => page.getByTestId('save-status').innerText())
			.toMatch(/Saved as version 2/);

		const plan = await latestPlan(page, siteId);
		expect(plan.version).toBe(2);
		const saved = plan.facets[0].geometry.coordinates[0] as Pt[];
		const moved = saved[k];
		// the corner landed on the target (to a pixel, about 3 cm here)…
		const miss = Geodesic.WGS84.Inverse(moved[1], moved[0], target[1], target[0]).s12!;
		expect(miss).toBeLessThan(0.08);
		// …and the stored area is the area of the stored outline, computed independently with
		// GeographicLib and the slope factor √(1+(rise/12)²) (docs/estimating-model.md §2).
		const independent =
			geodesicAreaM2({ type: 'Polygon', coordinates: [saved] }) *
			FT2_PER_M2 *
			pitchFactor(plan.facets[0].pitch);
		expect(rel(plan.measures[0].slopedAreaFt2, independent)).toBeLessThan(0.01);
		// the edit grew the facet by about 1.5 m × half its depth (a trapezoid); it did change
		expect(plan.measures[0].slopedAreaFt2).toBeGreaterThan(
			facets[0].properties.slopedAreaFt2 * 1.02
		);

		// version 1 is kept as it was
		const v1 = await page.request.get(`${server.url}/api/sites/${siteId}/roof-plans/1`);
		const old = (await v1.json()).plan;
		expect(rel(old.totals.slopedAreaFt2, truth.slopedAreaFt2)).toBeLessThan(0.01);
	});

	it('deletes, nudges and undoes from the keyboard', async () => {
		const rows = page.locator('tbody tr[data-facet-row]');
		await rows.nth(3).focus();
		await page.keyboard.press('Delete');
		await expect.poll(() => rows.count()).toBe(3);
		await page.keyboard.press('Control+z');
		await expect.poll(() => rows.count()).toBe(4);

		const v2 = await latestPlan(page, siteId);
		await rows.nth(0).focus();
		await page.keyboard.press('Shift+ArrowRight');
		await page.getByTestId('save-plan').click();
		await expect
			.poll(() => page.getByTestId('save-status').innerText())
			.toMatch(/Saved as version 3/);
		const v3 = await latestPlan(page, siteId);
		// every corner of facet 1 moved 10 px east (about 30 cm at this zoom), none moved north
		v3.facets[0].geometry.coordinates[0].forEach((p, i) => {
			const q = v2.facets[0].geometry.coordinates[0][i];
			const inv = Geodesic.WGS84.Inverse(q[1], q[0], p[1], p[0]);
			expect(inv.s12!).toBeGreaterThan(0.1);
			expect(inv.s12!).toBeLessThan(1);
			expect(Math.abs(inv.azi1! - 90)).toBeLessThan(1);
		});
		expect(v3.facets.slice(1)).toEqual(v2.facets.slice(1));

		// undo puts the facet back exactly where version 2 had it
		await page.keyboard.press('Control+z');
		await page.getByTestId('save-plan').click();
		await expect
			.poll(() => page.getByTestId('save-status').innerText())
			.toMatch(/Saved as version 4/);
		const v4 = await latestPlan(page, siteId);
		expect(v4.facets).toEqual(v2.facets);
	});

	it('starts a site-visit copy that saves as a site-visit version', async () => {
		await openEditor(page, siteId, 'maplibre');
		await page.getByRole('button', { name: 'Start site-visit copy' }).click();
		await page.getByRole('button', { name: 'Save site visit' }).click();
		await expect
			.poll(() => page.getByTestId('save-status').innerText())
			.toMatch(/Saved as version 5/);
		const plan = await latestPlan(page, siteId);
		expect(plan.source).toBe('site_visit');
		expect(plan.facets).toHaveLength(4);
	});

	it('opens an older version read-only', async () => {
		await page.goto(`${server.url}/sites/${siteId}/roof?version=1`);
		await page.waitForFunction(() => !!window.__clearpitchMap);
		await expect.poll(() => page.getByText('Version 1, read-only.').count()).toBe(1);
		expect(await page.getByTestId('save-plan').count()).toBe(0);
		expect(await page.getByLabel('Pitch of Facet 1').isDisabled()).toBe(true);
	});
});

describe('drawing from the keyboard', () => {
	it('places corners with Space at the cross, finishes with Enter, and Escape cancels', async () => {
		// h08: an asymmetric wood-shake gable; its east slope is a plain rectangle.
		const f = facetsOf('h08')[0];
		const siteId = await siteOf(page, 'h08');
		await openEditor(page, siteId, 'maplibre');
		await page.locator('body').focus();
		await page.keyboard.press('n');
		await expect.poll(() => page.getByRole('button', { name: /Finish/ }).count()).toBe(1);
		const eps = 1e-7;
		for (const [lon, lat] of f.geometry.coordinates[0].slice(0, -1)) {
			// bring the corner under the cross (as the arrow keys would), then Space
			await page.evaluate((b) => window.__clearpitchMap!.fitBounds(b, 0), [
				lon - eps,
				lat - eps,
				lon + eps,
				lat + eps
			] as [number, number, number, number]);
			await page.keyboard.press('Space');
		}
		await page.keyboard.press('Enter');
		await expect.poll(() => page.locator('tbody tr[data-facet-row]').count()).toBe(1);
		await page.getByLabel('Pitch of Facet 1').selectOption(String(f.properties.pitch));
		const shown = Number(
			(await page.getByTestId('total-sloped').innerText()).replace(/[^\d.]/g, '')
		);
		expect(rel(shown, f.properties.slopedAreaFt2)).toBeLessThan(0.005);

		// Escape drops a facet half drawn
		await page.locator('body').focus();
		await page.keyboard.press('n');
		await page.keyboard.press('Space');
		await page.keyboard.press('Space');
		await page.keyboard.press('Escape');
		await expect.poll(() => page.getByTestId('draw-facet').count()).toBe(1);
		expect(await page.locator('tbody tr[data-facet-row]').count()).toBe(1);
	});
});

describe('snapping to a neighbour', () => {
	it('puts a corner clicked 4 px from a neighbour corner exactly on it', async () => {
		// h01: a plain gable, two facets sharing the ridge.
		const [south, north] = facetsOf('h01');
		const siteId = await siteOf(page, 'h01');
		await openEditor(page, siteId, 'maplibre');
		await fit(page, [south, north]);
		await drawFacet(page, south.geometry.coordinates[0].slice(0, -1) as Pt[]);
		// Every corner of the north slope is clicked 4 px right and 3 px down of its truth; the
		// two on the ridge are shared with the south slope and must snap onto its corners.
		await drawFacet(page, north.geometry.coordinates[0].slice(0, -1) as Pt[], () => [4, 3]);
		await page.getByTestId('save-plan').click();
		await expect
			.poll(() => page.getByTestId('save-status').innerText())
			.toMatch(/Saved as version/);
		const plan = await latestPlan(page, siteId);
		const key = (p: number[]) => `${p[0]},${p[1]}`;
		const southCorners = new Set(plan.facets[0].geometry.coordinates[0].map(key));
		const shared = plan.facets[1].geometry.coordinates[0]
			.slice(0, -1)
			.filter((p) => southCorners.has(key(p)));
		expect(shared).toHaveLength(2);
		// the unshared corners kept the 5 px offset: snapping only pulls what is close to a neighbour
		const free = plan.facets[1].geometry.coordinates[0]
			.slice(0, -1)
			.filter((p) => !southCorners.has(key(p)));
		expect(free).toHaveLength(2);
	});
});

describe('the Leaflet fallback', () => {
	it('draws and saves a facet in a browser without WebGL', async () => {
		const noGl = await openBrowser({ width: 1280, height: 900, webgl: false });
		try {
			const p = noGl.pages()[0] ?? (await noGl.newPage());
			await signInAs(p, server.url, DEMO.sales);
			const f = facetsOf('h02')[0];
			const siteId = await siteOf(p, 'h02');
			await openEditor(p, siteId, 'leaflet');
			expect(await p.getByText('Simple map (this browser has no WebGL2)').count()).toBe(1);
			await fit(p, [f], 160);
			await drawFacet(p, f.geometry.coordinates[0].slice(0, -1) as Pt[]);
			expect(await p.locator('tbody tr[data-facet-row]').count()).toBe(1);
			await p.getByLabel('Pitch of Facet 1').selectOption(String(f.properties.pitch));
			await p.getByTestId('save-plan').click();
			await expect
				.poll(() => p.getByTestId('save-status').innerText())
				.toMatch(/Saved as version 1/);
			const plan = await latestPlan(p, siteId);
			// Leaflet places corners on whole pixels (about 2 cm here): still within 1%.
			expect(rel(plan.totals.slopedAreaFt2, f.properties.slopedAreaFt2)).toBeLessThan(0.01);
		} finally {
			await noGl.close();
		}
	});
});

describe('layout', () => {
	// Common practice, no source: an editor whose map fits the window needs no page scroll to reach
	// the map's lower edge; below the wide-screen breakpoint the panels stack under the map.
	it('fills the window below the header with the map at 1280×800, with no page scroll', async () => {
		const wide = await openBrowser({ width: 1280, height: 800 });
		try {
			const p = wide.pages()[0] ?? (await wide.newPage());
			await signInAs(p, server.url, DEMO.estimator);
			const siteId = await siteOf(p, 'h03');
			await openEditor(p, siteId, 'maplibre');
			const measure = () =>
				p.evaluate(() => {
					const header = document.querySelector('main header')!.getBoundingClientRect();
					const map = document.querySelector('[data-testid="roof-map"]')!.getBoundingClientRect();
					return {
						below: innerHeight - header.bottom,
						map: map.height,
						scroll: document.scrollingElement!.scrollHeight,
						inner: innerHeight
					};
				});
			const m = await measure();
			expect(m.map).toBeGreaterThanOrEqual(0.8 * m.below);
			expect(m.scroll).toBeLessThanOrEqual(m.inner);

			for (const [width, height] of [
				[768, 1024],
				[390, 844]
			]) {
				await p.setViewportSize({ width, height });
				await p.waitForFunction(
					(w) => innerWidth === w && !!document.querySelector('[data-testid="roof-map"]'),
					width
				);
				const n = await measure();
				// The panels go below, and the map keeps more than half the window.
				expect(n.map).toBeGreaterThan(0.5 * n.inner);
			}
		} finally {
			await wide.close();
		}
	});
});
