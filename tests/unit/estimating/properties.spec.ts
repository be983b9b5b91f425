import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	ACCESS_GRADES,
	cloneRateCard,
	DEFAULT_RATE_CARD,
	estimate,
	EstimateInputError,
	GROWTH_GRADES,
	MATERIALS,
	NOT_WALKABLE,
	pitchMultiplier,
	type FacetInput
} from '../../../src/lib/estimating';
import { localPlane } from './fixtures';

const sum = (xs: Array<{ amountCents: number }>) => xs.reduce((s, x) => s + x.amountCents, 0);

/** A convex polygon in metres: corners at sorted angles round a centre, so never self-crossing. */
const convexRing = fc
	.record({
		n: fc.integer({ min: 3, max: 9 }),
		r: fc.double({ min: 3, max: 40, noNaN: true }),
		seed: fc.array(fc.double({ min: 0.2, max: 1, noNaN: true }), { minLength: 9, maxLength: 9 })
	})
	.map(({ n, r, seed }) =>
		Array.from({ length: n }, (_, i) => {
			const a = (2 * Math.PI * (i + 0.6 * seed[i])) / n;
			return [r * Math.cos(a), r * Math.sin(a)] as const;
		})
	);

const where = fc.record({
	lat: fc.double({ min: -70, max: 70, noNaN: true }),
	lon: fc.double({ min: -179, max: 179, noNaN: true })
});

const facetArb = (id: string) =>
	fc
		.record({
			where,
			ring: convexRing,
			dx: fc.double({ min: -80, max: 80, noNaN: true }),
			pitch: fc.double({ min: 0, max: 24, noNaN: true }),
			material: fc.constantFrom(...MATERIALS),
			growth: fc.constantFrom(...GROWTH_GRADES),
			access: fc.constantFrom(...ACCESS_GRADES),
			stories: fc.constantFrom(1 as const, 2 as const, 3 as const)
		})
		.map(({ where, ring, dx, pitch, material, growth, access, stories }): FacetInput => {
			const plane = localPlane(where.lat, where.lon);
			return {
				id,
				geometry: plane.polygonM(ring.map(([x, y]) => [x + dx, y] as const)),
				pitch,
				material,
				growth,
				// roof access on fragile tile is refused; keep the generated facets valid
				access: access === 'roof' && NOT_WALKABLE.has(material) ? 'ladder' : access,
				stories
			};
		});

const roofArb = fc
	.integer({ min: 1, max: 6 })
	.chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => facetArb(`f${i}`))));

const jobArb = fc.record({
	facets: roofArb,
	discountPct: fc.option(fc.double({ min: 0, max: 100, noNaN: true }), { nil: undefined }),
	measuredOnSite: fc.boolean(),
	taxPct: fc.constantFrom(0, 5, 8.25, 13),
	minimumJobCents: fc.integer({ min: 0, max: 500_000 }),
	extras: fc.array(
		fc.record({ label: fc.constant('Extra'), priceCents: fc.integer({ min: 0, max: 50_000 }) }),
		{ maxLength: 3 }
	)
});

describe('properties (fast-check)', () => {
	it('sloped area equals plan × multiplier and grows with pitch', () => {
		fc.assert(
			fc.property(
				facetArb('a'),
				fc.double({ min: 0, max: 24, noNaN: true }),
				fc.double({ min: 0, max: 24, noNaN: true }),
				(f, p1, p2) => {
					const [lo, hi] = p1 <= p2 ? [p1, p2] : [p2, p1];
					const a = estimate({ facets: [{ ...f, pitch: lo }] }, DEFAULT_RATE_CARD).facets[0];
					const b = estimate({ facets: [{ ...f, pitch: hi }] }, DEFAULT_RATE_CARD).facets[0];
					expect(a.planAreaFt2).toBe(b.planAreaFt2);
					expect(a.slopedAreaFt2).toBeLessThanOrEqual(b.slopedAreaFt2);
					expect(
						Math.abs(a.slopedAreaFt2 - a.planAreaFt2 * pitchMultiplier(lo))
					).toBeLessThanOrEqual(1e-12 * a.slopedAreaFt2);
					expect(a.squares).toBeCloseTo(a.slopedAreaFt2 / 100, 12);
				}
			),
			{ numRuns: 200 }
		);
	});

	it('money adds up: lines sum to totals, deposit ≤ total, low ≤ total ≤ high, never under the minimum', () => {
		fc.assert(
			fc.property(jobArb, (job) => {
				const card = cloneRateCard();
				card.taxPct = job.taxPct;
				card.minimumJobCents = job.minimumJobCents;
				const r = estimate(
					{
						facets: job.facets,
						discountPct: job.discountPct,
						measuredOnSite: job.measuredOnSite,
						extras: job.extras
					},
					card
				);
				const p = r.price;
				for (const c of [p.totalCents, p.taxCents, p.depositCents, p.lowCents, p.highCents]) {
					expect(Number.isInteger(c)).toBe(true);
				}
				expect(sum(p.lineItems)).toBe(p.totalCents);
				expect(p.preTaxCents).toBe(p.subtotalCents + p.minimumAdjustmentCents - p.discountCents);
				expect(p.preTaxCents).toBeGreaterThanOrEqual(card.minimumJobCents);
				expect(p.totalCents).toBeGreaterThanOrEqual(card.minimumJobCents);
				expect(p.depositCents).toBeLessThanOrEqual(p.totalCents);
				expect(p.depositCents).toBeGreaterThanOrEqual(0);
				expect(p.lowCents).toBeLessThanOrEqual(p.totalCents);
				expect(p.totalCents).toBeLessThanOrEqual(p.highCents);
				expect(p.discountCents).toBeLessThanOrEqual(
					Math.round((p.subtotalCents * card.maxDiscountPct) / 100)
				);
				expect(sum(r.labour.lineItems)).toBe(r.labour.costCents);
				expect(sum(r.cost.lineItems)).toBe(r.cost.totalCents);
				expect(r.facets.reduce((s, f) => s + f.priceCents, 0)).toBe(
					sum(p.lineItems.filter((l) => l.code === 'facet'))
				);
				// one batch per distinct strength, and every facet in exactly one batch
				const strengths = new Set(r.facets.map((f) => f.mixStrengthPct));
				expect(r.chemistry.batches).toHaveLength(strengths.size);
				expect(r.chemistry.batches.flatMap((b) => b.facetIds).sort()).toEqual(
					r.facets.map((f) => f.id).sort()
				);
			}),
			{ numRuns: 300 }
		);
	});

	it('rejects any kinked (bow-tie) outline, naming the facet', () => {
		fc.assert(
			fc.property(roofArb, fc.nat(), (facets, pick) => {
				const k = pick % facets.length;
				const ring = facets[k].geometry.coordinates[0];
				// a convex polygon with two corners swapped crosses itself
				const bent = ring.slice(0, -1);
				const m = bent.length;
				const i = pick % m;
				const j = (i + 2) % m;
				[bent[(i + 1) % m], bent[j]] = [bent[j], bent[(i + 1) % m]];
				if (m === 3) return; // a triangle stays simple under any swap
				bent.push(bent[0]);
				const bad = facets.map((f, idx) =>
					idx === k ? { ...f, geometry: { type: 'Polygon' as const, coordinates: [bent] } } : f
				);
				let err: unknown;
				try {
					estimate({ facets: bad }, DEFAULT_RATE_CARD);
				} catch (e) {
					err = e;
				}
				expect(err).toBeInstanceOf(EstimateInputError);
				const issue = (err as EstimateInputError).issues.find((x) => x.path[1] === k);
				expect(issue?.path.slice(0, 3)).toEqual(['facets', k, 'geometry']);
				expect(['self_intersection', 'self_overlap']).toContain(issue?.code);
			}),
			{ numRuns: 200 }
		);
	});

	it('is deterministic: the same input gives the same result', () => {
		fc.assert(
			fc.property(jobArb, (job) => {
				const a = estimate({ facets: job.facets, extras: job.extras }, DEFAULT_RATE_CARD);
				const b = estimate({ facets: job.facets, extras: job.extras }, DEFAULT_RATE_CARD);
				expect(b).toEqual(a);
			}),
			{ numRuns: 50 }
		);
	});
});
