// Growth suggestions against the built server on a fresh seeded PGlite: the report of how often
// the suggested grade is kept (and its CSV, for the owner only), and the owner's calibration of
// the suggestion cuts from facets graded on confirmed site visits, with the refusal under five
// facets, the audit rows, the cuts reaching the roof editor, and a bad stored value read as the
// defaults. Every figure expected below is counted by hand from the facets set up here.
import * as devalue from 'devalue';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { planFacetsOf } from '../../geodata/scene';
import {
	DEFAULT_GROWTH_THRESHOLDS,
	growthScore,
	suggestGrade
} from '../../src/lib/estimating/growth-suggest';
import type { GrowthGrade } from '../../src/lib/estimating/types';
import type { GrowthCalibrationView } from '../../src/lib/schemas/growth-calibration';
import type { VisitDto } from '../../src/lib/types/site-visit';
import { createWithToken, signIn } from '../helpers/http';
import { postAction } from '../helpers/jobs';
import { openPglite } from '../helpers/pglite';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { prepareDataDir, type Prepared } from './api-helpers';

let server: TestServer;
let dir: string;
let prep: Prepared;
const cookie = {} as Record<'owner' | 'estimator' | 'sales' | 'crew', string>;
const est = { h03: '', h06: '' };
const siteOf = { h03: '', h06: '' };

/**
 * Per facet of h03 (4 facets) then h06 (5): the imagery score, the grade the estimator chose in
 * the office and the grade found on the site visit. The suggested grade is what the default cuts
 * [0.003, 0.026, 0.56, 1.57] give the score.
 */
const FACETS: Record<'h03' | 'h06', { score: number; chosen: GrowthGrade; site: GrowthGrade }[]> = {
	h03: [
		{ score: 0.002, chosen: 'G0', site: 'G0' }, // suggested G0
		{ score: 0.1, chosen: 'G1', site: 'G1' }, // suggested G2
		{ score: 0.3, chosen: 'G2', site: 'G1' }, // suggested G2
		{ score: 0.9, chosen: 'G3', site: 'G2' } // suggested G3
	],
	h06: [
		{ score: 1.0, chosen: 'G3', site: 'G2' }, // suggested G3
		{ score: 1.3, chosen: 'G2', site: 'G3' }, // suggested G3
		{ score: 1.8, chosen: 'G3', site: 'G3' }, // suggested G4
		{ score: 2.5, chosen: 'G4', site: 'G4' }, // suggested G4
		{ score: 3.0, chosen: 'G4', site: 'G4' } // suggested G4
	]
};

function suggestion(score: number) {
	// A reading whose measures add up to its score (growthScore weighs contrast by 4).
	const measures = { streakShare: 0, heavyShare: 0, contrast: score / 4 };
	const m = { pixels: 4000, cleanLevel: 150, ...measures, score: growthScore(measures) };
	return { ...suggestGrade(m), measures: m };
}

async function session(email: string): Promise<string> {
	const r = await signIn(server.url, email);
	if (!r.cookie) throw new Error(`sign-in as ${email}: ${r.status}`);
	return r.cookie;
}

async function pageData<T>(path: string, who = cookie.owner): Promise<T> {
	const res = await fetch(`${server.url}${path}/__data.json`, { headers: { cookie: who } });
	expect(res.status, path).toBe(200);
	const body = (await res.json()) as { nodes: ({ data: unknown[] } | null)[] };
	return devalue.unflatten(body.nodes.filter(Boolean).at(-1)!.data) as T;
}

const settings = () => pageData<{ growth: GrowthCalibrationView }>('/settings');
const visitAction = (id: string, name: string, fields: Record<string, string> = {}) =>
	postAction(server.url, cookie.sales, `/estimates/${id}/visit?/${name}`, fields);
const settingsAction = (name: string, who = cookie.owner) =>
	postAction(server.url, who, `/settings?/${name}`, {});

async function csv(path: string, who = cookie.owner) {
	const res = await fetch(server.url + path, { headers: { cookie: who }, redirect: 'manual' });
	return { status: res.status, type: res.headers.get('content-type'), text: await res.text() };
}
const csvRows = (text: string) =>
	text
		.trim()
		.split(/\r?\n/)
		.map((l) => l.split(',').map((c) => c.replace(/^"|"$/g, '')));

/** Grades each facet of a house's visit as found on site, then confirms the visit. */
async function gradeOnSiteAndConfirm(house: 'h03' | 'h06') {
	expect((await visitAction(est[house], 'start')).status).toBe(200);
	const visit = (await pageData<{ visit: VisitDto }>(`/estimates/${est[house]}/visit`)).visit;
	for (const [i, f] of visit.facets.entries()) {
		const r = await visitAction(est[house], 'facet', {
			facetId: f.id,
			pitch: String(f.pitch),
			material: f.material,
			growth: FACETS[house][i].site,
			access: f.access,
			stories: String(f.stories)
		});
		expect(r.status, `${house} facet ${i}`).toBe(200);
	}
	const c = await visitAction(est[house], 'confirm');
	expect(c.status, c.data).toBeLessThan(400);
}

async function auditActions(): Promise<string[]> {
	const db = openPglite(dir);
	try {
		await db.waitReady;
		const r = await db.query<{ action: string }>(
			`select action from audit_log where action like 'growth-calibration%' order by at, id`
		);
		return r.rows.map((x) => x.action);
	} finally {
		await db.close();
	}
}

beforeAll(async () => {
	dir = seededDataDir('growth-calibration');
	prep = await prepareDataDir(dir);
	server = await startServer(dir);
	cookie.owner = await session(DEMO.owner);
	cookie.estimator = await session(DEMO.estimator);
	cookie.sales = await session(DEMO.sales);
	cookie.crew = await session(DEMO.crew);
	type Created = { plan: { id: string }; estimate: { id: string } };
	for (const house of ['h03', 'h06'] as const) {
		const site = prep.sites.find((s) => s.houseId === house)!;
		siteOf[house] = site.id;
		const facets = planFacetsOf(house);
		expect(facets).toHaveLength(FACETS[house].length);
		const plan = (
			await createWithToken<Created>(server.url, prep.ownerToken, '/api/roof-plans', {
				siteId: site.id,
				facets: facets.map((f, i) => ({
					...f,
					growth: FACETS[house][i].chosen,
					growthSuggestion: suggestion(FACETS[house][i].score)
				})),
				baseVersion: null
			})
		).plan;
		const price = () =>
			createWithToken<Created>(server.url, prep.ownerToken, '/api/estimates', {
				roofPlanId: plan.id,
				siteId: site.id,
				save: true
			});
		est[house] = (await price()).estimate.id;
		// A second estimate from the same plan: its facets must not count twice.
		if (house === 'h03') await price();
	}
}, 120_000);
afterAll(async () => server?.stop());

describe('the suggested-grade report', () => {
	it('the suggestions as the defaults give them (a check of the set-up itself)', () => {
		const g = (s: number) => suggestGrade({ score: s }, DEFAULT_GROWTH_THRESHOLDS).grade;
		expect([...FACETS.h03, ...FACETS.h06].map((f) => g(f.score))).toEqual([
			'G0',
			'G2',
			'G2',
			'G3',
			'G3',
			'G3',
			'G4',
			'G4',
			'G4'
		]);
	});

	it('refuses to calibrate on fewer than five site-visit facets, and changes nothing', async () => {
		const empty = await settingsAction('calibrate');
		expect(empty.status).toBe(400);
		expect(empty.data).toContain('at least 5 facets graded on a confirmed site visit');
		expect(empty.data).toContain('there are 0.');
		await gradeOnSiteAndConfirm('h03');
		const before = await settings();
		expect(before.growth).toEqual({
			stored: null,
			cuts: DEFAULT_GROWTH_THRESHOLDS.cuts,
			available: 4
		});
		const four = await settingsAction('calibrate');
		expect(four.status).toBe(400);
		expect(four.data).toContain('there are 4.');
		expect(await settings()).toEqual(before);
	});

	it('counts suggested × chosen once per facet of the office plans, with the share kept', async () => {
		// Confirmed visits save site-visit copies as the latest versions; the report reads past them.
		await gradeOnSiteAndConfirm('h06');
		const r = await csv('/reports/growth-suggestions');
		expect(r.status).toBe(200);
		expect(r.type).toMatch(/^text\/csv/);
		// Hand count: G0→G0; G2→G1, G2→G2; G3→G3, G3→G3, G3→G2; G4→G3, G4→G4, G4→G4.
		expect(csvRows(r.text)).toEqual([
			[
				'Suggested',
				'Chosen G0',
				'Chosen G1',
				'Chosen G2',
				'Chosen G3',
				'Chosen G4',
				'Facets',
				'Kept',
				'Kept %'
			],
			['G0 clean', '1', '0', '0', '0', '0', '1', '1', '100'],
			['G2 moderate', '0', '1', '1', '0', '0', '2', '1', '50'],
			['G3 heavy', '0', '0', '1', '2', '0', '3', '2', '66.67'],
			['G4 severe', '0', '0', '0', '1', '2', '3', '2', '66.67'],
			['All', '1', '1', '2', '3', '2', '9', '6', '66.67']
		]);
	});

	it('is the owner’s only: other roles get 403, a signed-out caller the sign-in page', async () => {
		for (const role of ['estimator', 'sales', 'crew'] as const) {
			expect((await csv('/reports/growth-suggestions', cookie[role])).status, role).toBe(403);
		}
		const anon = await csv('/reports/growth-suggestions', '');
		expect(anon.status).toBe(303);
	});
});

describe('calibrating growth suggestions', () => {
	it('is the owner’s: other roles get 403 and nothing changes', async () => {
		const before = await settings();
		expect(before.growth).toEqual({
			stored: null,
			cuts: DEFAULT_GROWTH_THRESHOLDS.cuts,
			available: 9
		});
		for (const role of ['estimator', 'sales', 'crew'] as const) {
			expect((await settingsAction('calibrate', cookie[role])).status, role).toBe(403);
		}
		expect(await settings()).toEqual(before);
	});

	it('fits the cuts to the site grades, stores them, and shows the agreement before → after', async () => {
		const r = await settingsAction('calibrate');
		expect(r.status).toBe(200);
		// Before, with the default cuts: exact on facets 1, 6, 8 and 9 (scores 0.002, 1.3, 2.5,
		// 3.0), one grade off on the other five. The site grades rise with the score, so the fit
		// is exact: each cut midway between the last facet below and the first at or above.
		expect(r.data).toContain(
			'Calibrated on 9 site-visit facets: the suggestion matches the site grade on 4 of 9 before and 9 of 9 now; off by 5 → 0 grade steps in all.'
		);
		const after = (await settings()).growth;
		const cuts = [(0.002 + 0.1) / 2, (0.3 + 0.9) / 2, (1.0 + 1.3) / 2, (1.8 + 2.5) / 2];
		after.cuts.forEach((c, i) => expect(c).toBeCloseTo(cuts[i], 12));
		expect(after.stored).toMatchObject({
			samples: 9,
			exactBefore: 4,
			exactAfter: 9,
			errorBefore: 5,
			errorAfter: 0
		});
		// The roof editor's facet panel gets the company's cuts.
		const roof = await pageData<{ growthThresholds: { cuts: number[] } }>(
			`/sites/${siteOf.h03}/roof`,
			cookie.estimator
		);
		expect(roof.growthThresholds.cuts).toEqual(after.cuts);
	});

	it('a second calibration starts from the stored cuts, which already agree', async () => {
		const r = await settingsAction('calibrate');
		expect(r.status).toBe(200);
		expect(r.data).toContain('on 9 of 9 before and 9 of 9 now; off by 0 → 0');
	});

	it('resets to the defaults once; a second reset is refused', async () => {
		expect((await settingsAction('resetCalibration', cookie.sales)).status).toBe(403);
		const r = await settingsAction('resetCalibration');
		expect(r.status).toBe(200);
		expect((await settings()).growth.stored).toBeNull();
		const again = await settingsAction('resetCalibration');
		expect(again.status).toBe(400);
		expect(again.data).toContain('already use the default cuts');
		const roof = await pageData<{ growthThresholds: { cuts: number[] } }>(
			`/sites/${siteOf.h03}/roof`,
			cookie.estimator
		);
		expect(roof.growthThresholds.cuts).toEqual(DEFAULT_GROWTH_THRESHOLDS.cuts);
	});

	it('audits each calibration and reset, and reads a bad stored value as the defaults', async () => {
		await server.stop();
		expect(await auditActions()).toEqual([
			'growth-calibration',
			'growth-calibration',
			'growth-calibration-reset'
		]);
		const db = openPglite(dir);
		try {
			await db.waitReady;
			await db.query(
				`update companies set growth_calibration = '{"cuts":[3,2,1,0],"samples":2}'::jsonb`
			);
		} finally {
			await db.close();
		}
		server = await startServer(dir);
		cookie.owner = await session(DEMO.owner);
		cookie.estimator = await session(DEMO.estimator);
		expect((await settings()).growth).toMatchObject({
			stored: null,
			cuts: DEFAULT_GROWTH_THRESHOLDS.cuts
		});
		const roof = await pageData<{ growthThresholds: { cuts: number[] } }>(
			`/sites/${siteOf.h03}/roof`,
			cookie.estimator
		);
		expect(roof.growthThresholds.cuts).toEqual(DEFAULT_GROWTH_THRESHOLDS.cuts);
	}, 120_000);
});
