import { describe, expect, it } from 'vitest';
import {
	estimateRequestSchema,
	fieldIssues,
	toEstimateInput
} from '../../../src/lib/schemas/estimate';
import { rateCardSchema } from '../../../src/lib/schemas/rate-card';
import {
	cloneRateCard,
	DEFAULT_RATE_CARD,
	estimate,
	EstimateInputError,
	MATERIALS,
	type RateCard
} from '../../../src/lib/estimating';
import { gableRoof, localPlane, WRENFIELD } from './fixtures';

const plane = localPlane(WRENFIELD.lat, WRENFIELD.lon);
const body = (): Record<string, unknown> => JSON.parse(JSON.stringify({ facets: gableRoof() }));

function errorsOf(input: unknown) {
	const r = estimateRequestSchema.safeParse(input);
	expect(r.success).toBe(false);
	return r.success ? [] : fieldIssues(r.error.issues);
}

describe('estimateRequestSchema', () => {
	it('accepts a plain request and hands the model its input', () => {
		const r = estimateRequestSchema.safeParse({
			...body(),
			siteId: '0b7e6c1e-4a3f-4b8e-9d2c-3f1a2b3c4d5e',
			rateCardId: '6f1d2c3b-4a5e-4f60-8a7b-9c0d1e2f3a4b',
			stockStrengthPct: 11,
			testSpot: { strengthPct: 5, secondsToColourChange: 40, rinsedClean: true },
			extras: [{ label: 'Gutter flush', priceCents: 9000 }],
			discountPct: 5,
			measuredOnSite: true,
			siteFlags: { noGutters: true, plantsToProtect: false },
			save: true
		});
		expect(r.success).toBe(true);
		if (!r.success) return;
		const input = toEstimateInput(r.data);
		expect(input).not.toHaveProperty('siteId');
		expect(input).not.toHaveProperty('save');
		expect(estimate(input, DEFAULT_RATE_CARD).price.totalCents).toBeGreaterThan(0);
	});

	it('rejects an unknown material, listing the allowed values, at facets.N.material', () => {
		const b = body();
		(b.facets as Array<Record<string, unknown>>)[1].material = 'vinyl';
		const errs = errorsOf(b);
		expect(errs).toHaveLength(1);
		expect(errs[0].path).toBe('facets.1.material');
		for (const m of MATERIALS) expect(errs[0].message).toContain(m);
		expect(errs[0].message).toMatch(/^material must be one of/);
	});

	it('names the field for bad pitch, grade, access, stories and missing values', () => {
		const b = body();
		const f = (b.facets as Array<Record<string, unknown>>)[0];
		f.pitch = 30;
		f.growth = 'G9';
		f.access = 'crane';
		f.stories = 4;
		delete f.id;
		const byPath = Object.fromEntries(errorsOf(b).map((e) => [e.path, e.message]));
		expect(byPath['facets.0.pitch']).toBe('pitch (rise per 12) must be between 0 and 24');
		expect(byPath['facets.0.growth']).toMatch(/growth grade must be one of: G0, G1, G2, G3, G4/);
		expect(byPath['facets.0.access']).toMatch(
			/access grade must be one of: ground, ladder, roof, lift/
		);
		expect(byPath['facets.0.stories']).toMatch(/stories must be 1, 2 or 3/);
		expect(byPath['facets.0.id']).toMatch(/facet id must be a string/);
	});

	it('validates polygons strictly: range, closure, positions, vertices, holes, numbers', () => {
		const ring = plane.rectFt(30, 20).coordinates[0];
		const withRing = (r: unknown, extra: Record<string, unknown> = {}) => {
			const b = body();
			(b.facets as Array<Record<string, unknown>>)[0] = {
				...(b.facets as Array<Record<string, unknown>>)[0],
				edges: undefined,
				geometry: { type: 'Polygon', coordinates: [r], ...extra }
			};
			return b;
		};
		const first = (b: unknown) => errorsOf(b)[0];
		expect(first(withRing(ring.map((p, i) => (i === 1 ? [200, p[1]] : p))))).toEqual({
			path: 'facets.0.geometry.coordinates.0.1.0',
			message: 'longitude must be between -180 and 180'
		});
		expect(first(withRing(ring.map((p, i) => (i === 2 ? [p[0], -95] : p)))).path).toBe(
			'facets.0.geometry.coordinates.0.2.1'
		);
		expect(first(withRing(ring.slice(0, 4))).message).toMatch(/not closed/);
		expect(first(withRing([ring[0], ring[1], ring[0]])).message).toMatch(/at least 3 corners/);
		expect(first(withRing(ring.map((p, i) => (i === 1 ? [p[0], 'x'] : p)))).message).toMatch(
			/latitude must be a finite number/
		);
		expect(first(withRing(ring.map((p, i) => (i === 1 ? [p[0]] : p)))).path).toMatch(
			/^facets\.0\.geometry\.coordinates\.0\.1/
		);
		const many = Array.from({ length: 201 }, (_, k) => {
			const a = (2 * Math.PI * k) / 201;
			return plane.toLonLat([10 * Math.cos(a), 10 * Math.sin(a)]);
		});
		many.push(many[0]);
		expect(first(withRing(many)).message).toMatch(/at most 200 corners/);
		const b = body();
		const f0 = (b.facets as Array<Record<string, unknown>>)[0];
		f0.geometry = { type: 'Polygon', coordinates: [ring, ring] };
		f0.edges = undefined;
		expect(first(b).message).toMatch(/exactly one ring/);
		f0.geometry = { type: 'MultiPolygon', coordinates: [[ring]] };
		expect(first(b).path).toBe('facets.0.geometry.type');
		// JSON cannot carry NaN, but a caller in-process can
		expect(first(withRing(ring.map((p, i) => (i === 1 ? [Number.NaN, p[1]] : p)))).path).toBe(
			'facets.0.geometry.coordinates.0.1.0'
		);
	});

	it('checks edges, facet count, unique ids, test-spot facets, uuids and unknown keys', () => {
		const b = body();
		const fs = b.facets as Array<Record<string, unknown>>;
		fs[0].edges = ['eave', 'rake'];
		fs[1].id = fs[0].id;
		b.testSpot = {
			strengthPct: 5,
			secondsToColourChange: 30,
			rinsedClean: true,
			facetIds: ['nope']
		};
		b.siteId = 'not-a-uuid';
		b.discountPercent = 5;
		const byPath = Object.fromEntries(errorsOf(b).map((e) => [e.path, e.message]));
		expect(byPath['facets.0.edges']).toMatch(/4 expected, 2 given/);
		expect(byPath['siteId']).toMatch(/siteId must be a UUID/);
		expect(Object.values(byPath).join(' ')).toMatch(/discountPercent/);
		// the refinements that need the whole body run once the shape is right
		delete b.discountPercent;
		delete b.siteId;
		fs[0].edges = undefined;
		const later = Object.fromEntries(errorsOf(b).map((e) => [e.path, e.message]));
		expect(later['facets.1.id']).toMatch(/also used by facet 1/);
		expect(later['testSpot.facetIds.0']).toMatch(/unknown facet "nope"/);

		expect(errorsOf({ facets: [] })[0]).toEqual({
			path: 'facets',
			message: 'facets must list at least one facet'
		});
		const many = Array.from({ length: 101 }, (_, i) => ({ ...gableRoof()[0], id: `f${i}` }));
		expect(errorsOf(JSON.parse(JSON.stringify({ facets: many })))[0].message).toMatch(
			/at most 100 facets/
		);
		expect(errorsOf({})[0]).toEqual({
			path: 'facets',
			message: 'facets is required (or send roofPlanId to price a saved roof plan)'
		});
	});

	it('refuses a crossing outline in the schema, and the model names the same path', () => {
		const b = body();
		const fs = b.facets as Array<Record<string, unknown>>;
		const ring = plane.rectFt(30, 20, 100).coordinates[0];
		const bent = {
			...fs[0],
			id: 'bent',
			edges: undefined,
			geometry: { type: 'Polygon', coordinates: [[ring[0], ring[2], ring[1], ring[3], ring[0]]] }
		};
		fs.push(bent);
		expect(errorsOf(b)).toEqual([
			{ path: 'facets.2.geometry', message: expect.stringMatching(/crosses itself/) }
		]);
		// A caller of the model alone (no schema) hears of it at the same path.
		const input = toEstimateInput(estimateRequestSchema.parse({ facets: gableRoof() }));
		let err: unknown;
		try {
			estimate({ ...input, facets: [...input.facets, bent as never] }, DEFAULT_RATE_CARD);
		} catch (e) {
			err = e;
		}
		expect(err).toBeInstanceOf(EstimateInputError);
		expect(fieldIssues((err as EstimateInputError).issues)).toEqual([
			{ path: 'facets.2.geometry', message: expect.stringMatching(/crosses itself/) }
		]);
		expect((err as Error).message).toMatch(/^facets\.2\.geometry: /);
	});
});

describe('rateCardSchema', () => {
	it('accepts the default card unchanged', () => {
		expect(rateCardSchema.parse(DEFAULT_RATE_CARD)).toEqual(DEFAULT_RATE_CARD);
	});

	it('gives each bad figure a field error the Rates page can show', () => {
		// Numbers out of range still type-check; only the missing tax rate needs the looser type.
		const card: Omit<RateCard, 'taxPct'> & { taxPct?: number } = cloneRateCard();
		card.materials.slate.perSquareCents = -5;
		card.materials.metal.minStrengthPct = 5; // above its max of 4
		card.growth.G2.priceMultiplier = 20;
		card.depositPct = 120;
		card.labour.crewSize = 1.5;
		card.chemistry.stockStrengthPct = 4; // weaker than most materials' maximum
		delete card.taxPct;
		const r = rateCardSchema.safeParse(card);
		expect(r.success).toBe(false);
		if (r.success) return;
		const byPath = Object.fromEntries(fieldIssues(r.error.issues).map((e) => [e.path, e.message]));
		expect(byPath['materials.slate.perSquareCents']).toBe(
			'perSquareCents must be at least 0 cents'
		);
		expect(byPath['materials.metal.minStrengthPct']).toMatch(/not be above maxStrengthPct/);
		expect(byPath['growth.G2.priceMultiplier']).toBe('priceMultiplier must be at most 10');
		expect(byPath['depositPct']).toBe('depositPct must be at most 100%');
		expect(byPath['labour.crewSize']).toMatch(/crewSize must be a whole number/);
		expect(byPath['taxPct']).toBe('taxPct is required');
	});

	it('refuses a stock strength no material maximum stays under', () => {
		const card = cloneRateCard();
		card.chemistry.stockStrengthPct = 5;
		const r = rateCardSchema.safeParse(card);
		expect(r.success).toBe(false);
		if (r.success) return;
		expect(fieldIssues(r.error.issues).map((e) => e.path)).toEqual([
			'materials.asphalt_shingle.maxStrengthPct',
			'materials.clay_tile.maxStrengthPct',
			'materials.concrete_tile.maxStrengthPct'
		]);
	});
});
