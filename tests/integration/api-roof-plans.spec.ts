// The roof-plans API over HTTP against the built server: geometry refused with a reason that
// names the facet and nothing stored; versions; roles; other companies' sites.
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { house, planFacetsOf } from '../../geodata/scene';
import { closeDb, getDb } from '../../src/lib/server/db';
import { roofPlans } from '../../src/lib/server/db/schema';
import { addOtherCompany } from '../helpers/other-company';
import { sessionFor } from '../helpers/http';
import { seededDataDir, startServer, type TestServer } from '../helpers/server';
import { rectangleM } from '../unit/map/reference';

let server: TestServer;
let dataDir: string;
let estimator: string;
let crew: string;
let siteId: string;
let otherCompanySiteId: string;
let saves = 0;
/** Plans the demo seed wrote before these tests ran. */
let seededPlanIds: string[] = [];

beforeAll(async () => {
	dataDir = seededDataDir('api-roof-plans');
	const other = await addOtherCompany(dataDir, async (db) =>
		(await db.select({ id: roofPlans.id }).from(roofPlans)).map((r) => r.id)
	);
	otherCompanySiteId = other.siteId;
	seededPlanIds = other.more;
	server = await startServer(dataDir);
	estimator = await sessionFor(server.url, 'estimator');
	crew = await sessionFor(server.url, 'crew');
	const r = await call('GET', '/api/sites', estimator);
	siteId = (r.body.sites as { id: string; address: string }[]).find(
		(s) => s.address === house('h04')!.properties.address
	)!.id;
});
afterAll(async () => {
	await server?.stop();
});

async function call(
	method: string,
	path: string,
	cookie?: string,
	body?: unknown,
	headers: Record<string, string> = {}
) {
	const res = await fetch(server.url + path, {
		method,
		headers: {
			accept: 'application/json',
			origin: server.url,
			...(cookie ? { cookie } : {}),
			...(body !== undefined ? { 'content-type': 'application/json' } : {}),
			...headers
		},
		body: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body)
	});
	const text = await res.text();
	let parsed: Record<string, unknown> & { [k: string]: any }; // eslint-disable-line @typescript-eslint/no-explicit-any
	try {
		parsed = JSON.parse(text);
	} catch {
		parsed = { raw: text };
	}
	return { status: res.status, body: parsed };
}

const versionCount = async (id = siteId) =>
	((await call('GET', `/api/sites/${id}/roof-plans`, estimator)).body.versions as unknown[]).length;

// h04: hip roof with a hip-ended garage, seven clay-tile facets (geodata/scene.geojson).
const scene = planFacetsOf('h04');
const plan = (facets: unknown[] = scene, extra: object = {}) => ({ siteId, facets, ...extra });
const lon0 = -74.46;
const lat0 = 35.52;
const d = 0.0001;
const ring = (...pts: unknown[][]) => ({ type: 'Polygon', coordinates: [pts] });
const many = (n: number) => {
	const pts = Array.from({ length: n }, (_, i) => [
		lon0 + 0.0001 * Math.cos((2 * Math.PI * i) / n),
		lat0 + 0.0001 * Math.sin((2 * Math.PI * i) / n)
	]);
	return ring(...pts, pts[0]);
};

describe('POST /api/roof-plans refuses bad geometry', () => {
	const cases: [string, unknown, RegExp][] = [
		[
			'a bow-tie',
			ring([lon0, lat0], [lon0 + d, lat0 + d], [lon0 + d, lat0], [lon0, lat0 + d], [lon0, lat0]),
			/crosses itself/
		],
		['two points', ring([lon0, lat0], [lon0 + d, lat0], [lon0, lat0]), /at least 3 corners/],
		[
			'a longitude out of range',
			ring([lon0, lat0], [200, lat0], [lon0 + d, lat0 + d], [lon0, lat0]),
			/longitude must be between -180 and 180/
		],
		[
			'a latitude out of range',
			ring([lon0, lat0], [lon0 + d, -95], [lon0 + d, lat0 + d], [lon0, lat0]),
			/latitude must be between -90 and 90/
		],
		[
			'an unclosed ring',
			ring([lon0, lat0], [lon0 + d, lat0], [lon0 + d, lat0 + d], [lon0, lat0 + d]),
			/not closed/
		],
		[
			'strings for numbers',
			ring([lon0, lat0], ['-74.4599', '35.52'], [lon0 + d, lat0 + d], [lon0, lat0]),
			/must be a finite number/
		],
		[
			'null for a number',
			ring([lon0, lat0], [lon0 + d, null], [lon0 + d, lat0 + d], [lon0, lat0]),
			/must be a finite number/
		],
		['201 corners', many(201), /at most 200 corners/],
		['a 0.2 m² sliver', rectangleM(lat0, lon0, 0.4, 0.5), /smallest allowed is 0\.5 m²/],
		['a 6,400 m² facet', rectangleM(lat0, lon0, 80, 80), /largest allowed is 5,000 m²/],
		['no geometry at all', undefined, /GeoJSON Polygon/],
		// found by the fuzz below: these once reached the geometry checks and crashed them
		['no ring', { type: 'Polygon', coordinates: [] }, /exactly one ring/],
		['an empty ring', { type: 'Polygon', coordinates: [[]] }, /at least 3 corners/]
	];
	for (const [what, geometry, reason] of cases) {
		it(`${what}: 400 naming facet 2, nothing stored`, async () => {
			const before = await versionCount();
			const { edges: _e, ...bad } = { ...scene[1], geometry };
			const r = await call('POST', '/api/roof-plans', estimator, plan([scene[0], bad]));
			expect(r.status).toBe(400);
			const issues = r.body.issues as { path: string; message: string }[];
			expect(issues.length).toBeGreaterThan(0);
			expect(issues.every((i) => i.path.startsWith('facets.1.geometry'))).toBe(true);
			expect(issues[0].message).toMatch(/^Facet 2 \(North slope\): /);
			expect(issues.map((i) => i.message).join(' ')).toMatch(reason);
			expect(r.body.message).toMatch(/^The roof plan was not saved: Facet 2/);
			expect(await versionCount()).toBe(before);
		});
	}

	it('NaN in the body is not JSON: 400, nothing stored', async () => {
		const before = await versionCount();
		const text = JSON.stringify(plan([scene[0]])).replace(
			String(scene[0].geometry.coordinates[0][1][0]),
			'NaN'
		);
		expect(text).toContain('NaN');
		const r = await call('POST', '/api/roof-plans', estimator, text);
		expect(r.status).toBe(400);
		expect(r.body.message).toMatch(/not valid JSON/);
		expect(await versionCount()).toBe(before);
	});

	it('more than 100 facets, or none: 400, nothing stored', async () => {
		const before = await versionCount();
		const lots = Array.from({ length: 101 }, (_, i) => ({ ...scene[0], id: `f${i}` }));
		const r = await call('POST', '/api/roof-plans', estimator, plan(lots));
		expect(r.status).toBe(400);
		expect(r.body.issues[0]).toMatchObject({ path: 'facets' });
		expect(r.body.issues[0].message).toMatch(/at most 100 facets/);
		const none = await call('POST', '/api/roof-plans', estimator, plan([]));
		expect(none.status).toBe(400);
		expect(await versionCount()).toBe(before);
	});

	it('refuses a malformed growth suggestion on a facet with 400 naming it, and keeps a good one', async () => {
		const before = await versionCount();
		const good = {
			grade: 'G2',
			confidence: 0.73,
			measures: {
				pixels: 6972,
				cleanLevel: 118,
				streakShare: 0.21,
				heavyShare: 0.04,
				contrast: 0.3,
				score: 41
			}
		};
		const bad: [unknown, RegExp][] = [
			[{ ...good, grade: 'G9' }, /suggested growth grade must be one of: G0, G1, G2, G3, G4/],
			[{ ...good, confidence: 1.5 }, /suggestion confidence must be between 0 and 1/],
			[
				{ ...good, measures: { ...good.measures, pixels: 'many' } },
				/suggestion pixel count must be a finite number/
			],
			[{ ...good, source: 'elsewhere' }, /unknown field in growth suggestion: source/],
			['G2', /growth suggestion must be an object with grade, confidence and measures/]
		];
		for (const [growthSuggestion, reason] of bad) {
			const r = await call(
				'POST',
				'/api/roof-plans',
				estimator,
				plan([scene[0], { ...scene[1], growthSuggestion }])
			);
			expect(r.status, JSON.stringify(growthSuggestion)).toBe(400);
			const issues = r.body.issues as { path: string; message: string }[];
			expect(issues.every((i) => i.path.startsWith('facets.1.growthSuggestion'))).toBe(true);
			expect(issues.map((i) => i.message).join(' ')).toMatch(reason);
		}
		expect(await versionCount()).toBe(before);

		const ok = await call(
			'POST',
			'/api/roof-plans',
			estimator,
			plan([scene[0], { ...scene[1], growthSuggestion: good }])
		);
		expect(ok.status).toBe(201);
		saves++;
		const back = await call('GET', `/api/roof-plans/${ok.body.plan.id}`, estimator);
		expect(back.body.plan.facets[1].growthSuggestion).toEqual(good);
		expect(back.body.plan.facets[0].growthSuggestion).toBeUndefined();
	});

	it('a body that is not JSON or too large: 415 / 413, nothing stored', async () => {
		const before = await versionCount();
		const form = await call('POST', '/api/roof-plans', estimator, undefined, {
			'content-type': 'application/x-www-form-urlencoded'
		});
		expect(form.status).toBe(415);
		const huge = JSON.stringify(plan([{ ...scene[0], label: 'x'.repeat(600_000) }]));
		const big = await call('POST', '/api/roof-plans', estimator, huge);
		expect(big.status).toBe(413);
		expect(await versionCount()).toBe(before);
	});

	it('never answers a fuzzed body with a 500, and writes only what it accepts', async () => {
		const before = await versionCount();
		const good = plan(scene.slice(0, 2));
		// Replace one field somewhere in a good body with an arbitrary JSON value.
		const paths = [
			['siteId'],
			['facets'],
			['facets', 0],
			['facets', 1, 'geometry'],
			['facets', 1, 'geometry', 'coordinates'],
			['facets', 1, 'geometry', 'coordinates', 0, 2],
			['facets', 1, 'geometry', 'coordinates', 0, 2, 0],
			['facets', 0, 'pitch'],
			['facets', 0, 'edges'],
			['facets', 0, 'edges', 1],
			['facets', 1, 'stories'],
			['facets', 0, 'label'],
			['baseVersion'],
			['source']
		];
		let accepted = 0;
		await fc.assert(
			fc.asyncProperty(
				fc.constantFrom(...paths),
				fc.jsonValue({ maxDepth: 3 }),
				async (path, value) => {
					const body = structuredClone(good) as Record<string, unknown>;
					let at: Record<string | number, unknown> = body;
					for (const k of path.slice(0, -1)) at = at[k] as Record<string | number, unknown>;
					at[path[path.length - 1]] = value;
					const r = await call('POST', '/api/roof-plans', estimator, body);
					if (r.status === 201) accepted++;
					return r.status < 500 && [201, 400, 404, 409].includes(r.status);
				}
			),
			{ numRuns: 120 }
		);
		saves += accepted;
		expect(await versionCount()).toBe(before + accepted);
	});
});

describe('versions', () => {
	it('numbers each save, keeps every version, and lists them newest first', async () => {
		const start = await versionCount();
		const made: { id: string; version: number }[] = [];
		for (const n of [7, 6, 5]) {
			const r = await call('POST', '/api/roof-plans', estimator, plan(scene.slice(0, n)));
			expect(r.status).toBe(201);
			made.push(r.body.plan);
			saves++;
		}
		expect(made.map((p) => p.version)).toEqual([start + 1, start + 2, start + 3]);
		const list = (await call('GET', `/api/sites/${siteId}/roof-plans`, estimator)).body.versions;
		expect(list.slice(0, 3).map((v: { version: number }) => v.version)).toEqual([
			start + 3,
			start + 2,
			start + 1
		]);
		// the first of the three still holds all seven facets, untouched by the later saves
		const first = await call('GET', `/api/sites/${siteId}/roof-plans/${start + 1}`, estimator);
		expect(first.body.plan.facets).toHaveLength(7);
		expect(first.body.plan.facets[3].geometry).toEqual(scene[3].geometry);
		// …and its stored sloped area is the scene's truth for h04 (GeographicLib, 0.001%)
		const truth = house('h04')!.properties.slopedAreaFt2;
		expect(Math.abs(first.body.plan.totals.slopedAreaFt2 - truth) / truth).toBeLessThan(1e-5);
		const byId = await call('GET', `/api/roof-plans/${made[2].id}`, estimator);
		expect(byId.body.plan.version).toBe(start + 3);
		expect(byId.body.plan.facets).toHaveLength(5);
	});

	it('refuses a save based on a stale version with 409, storing nothing', async () => {
		const latest = await versionCount();
		const r = await call(
			'POST',
			'/api/roof-plans',
			estimator,
			plan(scene, { baseVersion: latest - 1 })
		);
		expect(r.status).toBe(409);
		expect(r.body.latestVersion).toBe(latest);
		expect(await versionCount()).toBe(latest);
		const ok = await call(
			'POST',
			'/api/roof-plans',
			estimator,
			plan(scene, { baseVersion: latest })
		);
		expect(ok.status).toBe(201);
		saves++;
		expect(ok.body.plan.version).toBe(latest + 1);
	});

	it('records a site-visit copy and what it was copied from', async () => {
		const latest = await versionCount();
		const r = await call(
			'POST',
			'/api/roof-plans',
			estimator,
			plan(scene, { source: 'site_visit', basedOnVersion: latest, note: 'Checked on site' })
		);
		expect(r.status).toBe(201);
		saves++;
		expect(r.body.plan).toMatchObject({
			source: 'site_visit',
			basedOnVersion: latest,
			note: 'Checked on site'
		});
		const bad = await call(
			'POST',
			'/api/roof-plans',
			estimator,
			plan(scene, { basedOnVersion: latest + 50 })
		);
		expect(bad.status).toBe(400);
		expect(bad.body.issues[0].path).toBe('basedOnVersion');
	});

	it('answers 400 for a malformed version number and 404 for a missing one', async () => {
		expect((await call('GET', `/api/sites/${siteId}/roof-plans/abc`, estimator)).status).toBe(400);
		expect((await call('GET', `/api/sites/${siteId}/roof-plans/9999`, estimator)).status).toBe(404);
	});
});

describe('who may read and write', () => {
	it('gives crew a 403 on every roof-plan route and writes nothing', async () => {
		const before = await versionCount();
		const w = await call('POST', '/api/roof-plans', crew, plan());
		expect(w.status).toBe(403);
		expect(w.body.message).toMatch(/role/);
		expect((await call('GET', `/api/sites/${siteId}/roof-plans`, crew)).status).toBe(403);
		expect((await call('GET', `/api/sites/${siteId}/roof-plans/latest`, crew)).status).toBe(403);
		expect(await versionCount()).toBe(before);
	});

	it('asks a signed-out caller to sign in', async () => {
		expect((await call('POST', '/api/roof-plans', undefined, plan())).status).toBe(401);
	});

	it("treats another company's site and an unknown site as not found", async () => {
		const other = await call(
			'POST',
			'/api/roof-plans',
			estimator,
			plan(scene, { siteId: otherCompanySiteId })
		);
		expect(other.status).toBe(404);
		expect(other.body.message).toBe('No such site.');
		const unknown = await call(
			'POST',
			'/api/roof-plans',
			estimator,
			plan(scene, { siteId: '00000000-0000-4000-8000-000000000000' })
		);
		expect(unknown.status).toBe(404);
		expect(
			(await call('GET', `/api/sites/${otherCompanySiteId}/roof-plans`, estimator)).status
		).toBe(404);
		expect(
			(await call('GET', `/api/sites/${otherCompanySiteId}/roof-plans/latest`, estimator)).status
		).toBe(404);
		expect((await call('GET', `/api/sites/${otherCompanySiteId}`, estimator)).status).toBe(404);
		const page = await fetch(`${server.url}/sites/${otherCompanySiteId}/roof`, {
			headers: { cookie: estimator }
		});
		expect(page.status).toBe(404);
	});
});

describe('what is on disk', () => {
	it('holds the seeded plans and exactly the accepted saves, all on the right site', async () => {
		await server.stop();
		process.env.CLEARPITCH_DATA_DIR = dataDir;
		const db = await getDb();
		const rows = await db.select({ id: roofPlans.id, siteId: roofPlans.siteId }).from(roofPlans);
		await closeDb();
		const ours = rows.filter((r) => !seededPlanIds.includes(r.id));
		expect(rows.length - ours.length).toBe(seededPlanIds.length);
		expect(ours).toHaveLength(saves);
		expect(ours.every((r) => r.siteId === siteId)).toBe(true);
	});
});
