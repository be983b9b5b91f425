// POST /api/estimates tied to a roof plan, against the built server on a fresh seeded PGlite:
// a roofPlanId must be one of the caller's plans and belong to the estimate's site; the server
// prices that plan version's stored facets; a refusal names roofPlanId and writes nothing.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { planFacetsOf } from '../../geodata/scene';
import { addEmptyPlan, addOtherCompany } from '../helpers/other-company';
import { seededDataDir, startServer, type TestServer } from '../helpers/server';
import { prepareDataDir, type Prepared } from './api-helpers';

let server: TestServer;
let dataDir: string;
let prep: Prepared;
/** Two of the demo company's sites that each have a roof plan, and the plans' ids. */
const planned: { siteId: string; planId: string }[] = [];
/** A site of the demo company with no plan of its own. */
let bareSiteId: string;
/** A plan of an invented second tenant. */
let otherCompanyPlanId: string;

const siteOf = (houseId: string) => prep.sites.find((s) => s.houseId === houseId)!.id;

beforeAll(async () => {
	dataDir = seededDataDir('estimate-roof-plan');
	prep = await prepareDataDir(dataDir);
	otherCompanyPlanId = (await addOtherCompany(dataDir, addEmptyPlan)).more;
	server = await startServer(dataDir);
	// Two measured sites, saved the way the editor saves them.
	for (const houseId of ['h04', 'h05']) {
		const siteId = siteOf(houseId);
		const r = await post({ siteId, facets: planFacetsOf(houseId) }, '/api/roof-plans');
		expect(r.status).toBe(201);
		planned.push({ siteId, planId: r.json.plan.id });
	}
	bareSiteId = siteOf('h01');
});
afterAll(async () => server?.stop());

/**
 * The fields these tests read from any reply (plan, estimate, refusal). Each is asserted at run
 * time, so a missing one fails the check that reads it.
 */
type FacetReply = Record<string, unknown> & { id: string; pitch: number };
type Reply = {
	message: string;
	issues: { path: string; message: string }[];
	plan: { id: string; facets: FacetReply[] };
	estimate: { id: string };
	price: unknown;
	totals: unknown;
	roofPlanId: string | null;
	siteId: string;
	input: { facets: { id: string }[] };
	total: number;
};

async function post(body: unknown, path = '/api/estimates') {
	const res = await fetch(server.url + path, {
		method: 'POST',
		headers: {
			accept: 'application/json',
			'content-type': 'application/json',
			authorization: `Bearer ${prep.ownerToken}`
		},
		body: JSON.stringify(body)
	});
	return { status: res.status, json: (await res.json()) as Reply };
}

async function get(path: string) {
	const res = await fetch(server.url + path, {
		headers: { accept: 'application/json', authorization: `Bearer ${prep.ownerToken}` }
	});
	return { status: res.status, json: (await res.json()) as Reply };
}

const paths = (json: { issues?: { path: string }[] }) => (json.issues ?? []).map((i) => i.path);

describe('an estimate saved from a roofPlanId', () => {
	const refusals: [string, () => { siteId: string; roofPlanId: string }][] = [
		[
			'another company’s plan',
			() => ({ siteId: planned[0].siteId, roofPlanId: otherCompanyPlanId })
		],
		['another site’s plan', () => ({ siteId: planned[1].siteId, roofPlanId: planned[0].planId })],
		['a plan of a site with none', () => ({ siteId: bareSiteId, roofPlanId: planned[0].planId })],
		[
			'a made-up plan id',
			() => ({ siteId: planned[0].siteId, roofPlanId: '7d1c2f4e-0b6a-4c1e-9f3d-2a5b8c9e1f00' })
		]
	];

	for (const [what, ids] of refusals) {
		it(`refuses ${what} with a 400 naming roofPlanId and writes nothing`, async () => {
			const before = await countRowsLive();
			const r = await post({ ...ids(), save: true });
			expect(r.status).toBe(400);
			expect(paths(r.json)).toContain('roofPlanId');
			expect(r.json.message).toMatch(/roofPlanId/);
			expect(await countRowsLive()).toBe(before);
		});
	}

	it('refuses a plan of another site even when the facets are sent along', async () => {
		// Today's editor sends the facets and the plan id; the id alone must not slip through.
		const plan = await get(`/api/roof-plans/${planned[0].planId}`);
		expect(plan.status).toBe(200);
		const before = await countRowsLive();
		const r = await post({
			siteId: planned[1].siteId,
			roofPlanId: planned[0].planId,
			save: true,
			facets: plan.json.plan.facets.map(toEstimateFacet)
		});
		expect(r.status).toBe(400);
		expect(await countRowsLive()).toBe(before);
	});

	it('prices the stored facets of that plan version and links the estimate to it', async () => {
		const { siteId, planId } = planned[0];
		const plan = await get(`/api/roof-plans/${planId}`);
		expect(plan.status).toBe(200);
		const facets = plan.json.plan.facets.map(toEstimateFacet);

		// The same facets sent in full, priced without saving: the reference answer.
		const reference = await post({ siteId, facets });
		expect(reference.status).toBe(200);

		const before = await countRowsLive();
		const r = await post({ siteId, roofPlanId: planId, save: true });
		expect(r.status).toBe(201);
		expect(await countRowsLive()).toBe(before + 1);
		expect(r.json.price).toEqual(reference.json.price);
		expect(r.json.totals).toEqual(reference.json.totals);

		const stored = await get(`/api/estimates/${r.json.estimate.id}`);
		expect(stored.status).toBe(200);
		expect(stored.json.roofPlanId).toBe(planId);
		expect(stored.json.siteId).toBe(siteId);
		expect(stored.json.input.facets.map((f: { id: string }) => f.id)).toEqual(
			facets.map((f: { id: string }) => f.id)
		);
	});

	it('takes facets sent along only when they are the plan’s own, and writes nothing otherwise', async () => {
		const { siteId, planId } = planned[1];
		const plan = await get(`/api/roof-plans/${planId}`);
		const facets = plan.json.plan.facets.map(toEstimateFacet);
		const before = await countRowsLive();
		const changed = facets.map((f: { pitch: number }, i: number) =>
			i === 0 ? { ...f, pitch: f.pitch + 1 } : f
		);
		const refused = await post({ siteId, roofPlanId: planId, save: true, facets: changed });
		expect(refused.status).toBe(400);
		expect(paths(refused.json)).toContain('facets');
		expect(await countRowsLive()).toBe(before);
		const same = await post({ siteId, roofPlanId: planId, save: true, facets });
		expect(same.status).toBe(201);
		expect(await countRowsLive()).toBe(before + 1);
	});

	it('refuses a body with neither facets nor a roofPlanId, naming facets', async () => {
		const r = await post({ siteId: planned[0].siteId, save: true });
		expect(r.status).toBe(400);
		expect(paths(r.json)).toContain('facets');
	});
});

/**
 * A roof-plan facet as the API returns it, as /api/estimates takes it: the same shape (one facet
 * schema), so only the plan view's own extras are dropped.
 */
function toEstimateFacet(f: FacetReply): FacetReply {
	const { id, label, geometry, pitch, material, growth, access, stories, edges } = f;
	return { id, label, geometry, pitch, material, growth, access, stories, edges };
}

// PGlite allows one process per data dir, so the live count comes from the server's own list.
async function countRowsLive(): Promise<number> {
	const r = await get('/api/estimates?pageSize=1');
	expect(r.status).toBe(200);
	return r.json.total as number;
}
