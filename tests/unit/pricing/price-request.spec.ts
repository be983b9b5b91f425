// The pricing step that runs on a worker thread, run here in place: it must answer what the
// model answers, refuse what the API refuses, and ask for the card the body names.
import { describe, expect, it } from 'vitest';
import { cloneRateCard, DEFAULT_RATE_CARD, estimate } from '../../../src/lib/estimating';
import { toEstimateInput, estimateRequestSchema } from '../../../src/lib/schemas/estimate';
import {
	priceRequest,
	type CardRef,
	type PriceOutcome
} from '../../../src/lib/server/pricing/price-request';
import { gableRoof } from '../estimating/fixtures';

const CARD_ID = '6f1d2c3b-4a5e-4f60-8a7b-9c0d1e2f3a4b';
const OTHER_ID = '0b7e6c1e-4a3f-4b8e-9d2c-3f1a2b3c4d5e';
const SITE_ID = '1c2d3e4f-5a6b-4c7d-8e9f-0a1b2c3d4e5f';

const cardRef = (id = CARD_ID, card = DEFAULT_RATE_CARD, version = 3): CardRef => ({
	id,
	version,
	json: JSON.stringify(card)
});
const bytes = (body: unknown) =>
	new TextEncoder().encode(typeof body === 'string' ? body : JSON.stringify(body));
const run = (body: unknown, card: CardRef | null = cardRef()) =>
	priceRequest({ body: bytes(body), card });

function refusal(o: PriceOutcome) {
	if (o.kind !== 'refused') throw new Error(`expected a refusal, got ${o.kind}`);
	return o.refusal;
}

describe('priceRequest', () => {
	it('answers the model’s own figures plus the card it priced with', () => {
		const body = { facets: gableRoof(), stockStrengthPct: 12.5, discountPct: 5 };
		const o = run(body);
		expect(o.kind).toBe('priced');
		const answer = JSON.parse(new TextDecoder().decode((o as { json: Uint8Array }).json));
		const expected = estimate(
			toEstimateInput(estimateRequestSchema.parse(body)),
			DEFAULT_RATE_CARD
		);
		expect(answer).toEqual({
			...JSON.parse(JSON.stringify(expected)),
			rateCard: { id: CARD_ID, version: 3 }
		});
	});

	it('prices with the card it is given, not one it saw before', () => {
		const dearer = cloneRateCard(DEFAULT_RATE_CARD);
		dearer.materials.asphalt_shingle.perSquareCents *= 2;
		const body = { facets: gableRoof(), rateCardId: OTHER_ID };
		const total = (o: PriceOutcome) =>
			JSON.parse(new TextDecoder().decode((o as { json: Uint8Array }).json)).price.totalCents;
		const base = total(run({ facets: gableRoof() }));
		const other = total(run(body, cardRef(OTHER_ID, dearer, 4)));
		expect(other).toBeGreaterThan(base);
		expect(total(run({ facets: gableRoof() }))).toBe(base);
	});

	it('asks for the card the body names, or says there is none', () => {
		expect(run({ facets: gableRoof(), rateCardId: OTHER_ID })).toEqual({
			kind: 'needs-card',
			rateCardId: OTHER_ID
		});
		expect(run({ facets: gableRoof() }, null)).toEqual({ kind: 'needs-card', rateCardId: null });
	});

	it('refuses an empty body, bad JSON, bad fields and a roof the model refuses, with reasons', () => {
		expect(refusal(run('  \n'))).toMatchObject({
			status: 400,
			issues: [{ path: '', message: 'body is empty' }]
		});
		expect(refusal(run('{"facets": ['))).toMatchObject({
			status: 400,
			message: expect.stringMatching(/^The request body is not valid JSON/)
		});
		const bad = { facets: gableRoof().map((f, i) => (i === 0 ? { ...f, pitch: 30 } : f)) };
		expect(refusal(run(bad)).issues).toContainEqual({
			path: 'facets.0.pitch',
			message: 'Facet 1: pitch (rise per 12) must be between 0 and 24'
		});
		// Roof access on clay tile: not walked (common practice, no single source;
		// docs/estimating-model.md §5).
		const tile = {
			facets: gableRoof().map((f) => ({ ...f, material: 'clay_tile', access: 'roof' }))
		};
		const r = refusal(run(tile));
		expect(r.message).toMatch(/^The roof plan has/);
		expect(r.issues?.[0].path).toBe('facets.0.access');
	});

	it('needs a site to save to, and hands back what the store needs', () => {
		expect(refusal(run({ facets: gableRoof(), save: true })).issues).toEqual([
			{ path: 'siteId', message: 'siteId is required when save is true' }
		]);
		const o = run({ facets: gableRoof(), save: true, siteId: SITE_ID });
		expect(o).toMatchObject({
			kind: 'save',
			siteId: SITE_ID,
			roofPlanId: null,
			rateCard: { id: CARD_ID, version: 3 }
		});
		if (o.kind === 'save') expect(o.input).not.toHaveProperty('save');
	});

	it('asks for the roof plan a body names, then prices its facets as if they were sent', () => {
		const PLAN_ID = '2a3b4c5d-6e7f-4a8b-9c0d-1e2f3a4b5c6d';
		const body = { roofPlanId: PLAN_ID, siteId: SITE_ID, save: true, discountPct: 5 };
		expect(run(body)).toEqual({ kind: 'needs-plan', roofPlanId: PLAN_ID, siteId: SITE_ID });
		// Another plan than the one asked for is not taken for it.
		const wrong = { id: OTHER_ID, facets: gableRoof() };
		expect(priceRequest({ body: bytes(body), card: cardRef(), plan: wrong }).kind).toBe(
			'needs-plan'
		);
		const o = priceRequest({
			body: bytes(body),
			card: cardRef(),
			plan: { id: PLAN_ID, facets: gableRoof() }
		});
		if (o.kind !== 'save') throw new Error(`expected a save, got ${o.kind}`);
		expect(o.roofPlanId).toBe(PLAN_ID);
		const sent = estimate(
			toEstimateInput(estimateRequestSchema.parse({ facets: gableRoof(), discountPct: 5 })),
			DEFAULT_RATE_CARD
		);
		expect(o.result).toEqual(sent);
	});

	it('takes facets sent with a roofPlanId only when they are that plan’s, and needs one of them', () => {
		const PLAN_ID = '2a3b4c5d-6e7f-4a8b-9c0d-1e2f3a4b5c6d';
		const plan = { id: PLAN_ID, facets: gableRoof() };
		const task = (facets: unknown) => ({
			body: bytes({ facets, roofPlanId: PLAN_ID, siteId: SITE_ID, save: true }),
			card: cardRef(),
			plan
		});
		expect(priceRequest(task(gableRoof())).kind).toBe('save');
		const steeper = gableRoof().map((f) => ({ ...f, pitch: f.pitch + 1 }));
		expect(refusal(priceRequest(task(steeper))).issues?.[0]).toMatchObject({
			path: 'facets',
			message: expect.stringMatching(/differ from the saved roof plan/)
		});
		expect(refusal(priceRequest(task(gableRoof().slice(1)))).issues?.[0].path).toBe('facets');
		expect(refusal(run({ siteId: SITE_ID })).issues?.[0].path).toBe('facets');
	});
});
