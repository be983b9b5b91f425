import { describe, expect, it } from 'vitest';
import { accessRefusal, ladderPlacements, NOT_WALKABLE } from '../../../src/lib/estimating/access';
import { applyTestSpot, suggestStrength } from '../../../src/lib/estimating/growth';
import {
	cloneRateCard,
	DEFAULT_RATE_CARD,
	estimate,
	EstimateInputError,
	MATERIALS,
	type EstimateInput
} from '../../../src/lib/estimating';
import { facet, gableRoof, localPlane, WRENFIELD } from './fixtures';

const card = DEFAULT_RATE_CARD;
const plane = localPlane(WRENFIELD.lat, WRENFIELD.lon);

function issuesOf(input: EstimateInput) {
	try {
		estimate(input, card);
	} catch (e) {
		if (e instanceof EstimateInputError) return e.issues;
		throw e;
	}
	return [];
}

describe('growth grade → mix strength', () => {
	it('base + grade step, floored by the minimum and capped by the maximum', () => {
		const shingle = card.materials.asphalt_shingle; // 3–5%, base 3
		expect(suggestStrength(shingle, card.growth.G0)).toBe(3); // 3 − 1, floored at 3
		expect(suggestStrength(shingle, card.growth.G1)).toBe(3);
		expect(suggestStrength(shingle, card.growth.G2)).toBe(4);
		expect(suggestStrength(shingle, card.growth.G3)).toBe(5);
		expect(suggestStrength(shingle, card.growth.G4)).toBe(5); // 6, capped at 5
		const slate = card.materials.slate; // 3–4%
		expect(suggestStrength(slate, card.growth.G4)).toBe(4);
	});

	it('strength never leaves the material range for any grade', () => {
		for (const m of MATERIALS) {
			for (const g of ['G0', 'G1', 'G2', 'G3', 'G4'] as const) {
				const s = suggestStrength(card.materials[m], card.growth[g]);
				expect(s).toBeGreaterThanOrEqual(card.materials[m].minStrengthPct);
				expect(s).toBeLessThanOrEqual(card.materials[m].maxStrengthPct);
			}
		}
	});

	it('applications and expectation notes follow the grade', () => {
		const r = estimate(
			{
				facets: [
					facet({ id: 'a', geometry: plane.rectFt(20, 20), growth: 'G1' }),
					facet({ id: 'b', geometry: plane.rectFt(20, 20, 40), growth: 'G3' }),
					facet({ id: 'c', geometry: plane.rectFt(20, 20, 80), growth: 'G4' })
				]
			},
			card
		);
		expect(r.facets.map((f) => f.applications)).toEqual([1, 2, 2]);
		// common practice, no source: treated lichen whitens first and clears over weeks
		// (docs/estimating-model.md §4)
		const lichen = r.expectations.find((e) => e.code === 'growth.lichen');
		expect(lichen?.facetIds).toEqual(['b', 'c']);
		expect(lichen?.message).toMatch(/white/);
		expect(r.expectations.find((e) => e.code === 'growth.severe')?.facetIds).toEqual(['c']);
	});
});

describe('test spot', () => {
	const shingle = card.materials.asphalt_shingle;
	const rules = card.testSpot;

	it('a quick, clean change at or below the suggestion lowers one step (not below what was tested)', () => {
		expect(
			applyTestSpot(
				5,
				shingle,
				{ strengthPct: 3, secondsToColourChange: 30, rinsedClean: true },
				rules
			)
		).toMatchObject({
			strengthPct: 4,
			effect: 'lowered'
		});
		expect(
			applyTestSpot(
				5,
				shingle,
				{ strengthPct: 4.5, secondsToColourChange: 45, rinsedClean: true },
				rules
			)
		).toMatchObject({
			strengthPct: 4.5,
			effect: 'lowered'
		});
		// already at the minimum: nothing to lower
		expect(
			applyTestSpot(
				3,
				shingle,
				{ strengthPct: 3, secondsToColourChange: 20, rinsedClean: true },
				rules
			).effect
		).toBe('none');
		// quick but at a stronger mix than suggested proves nothing about the weaker one
		expect(
			applyTestSpot(
				4,
				shingle,
				{ strengthPct: 5, secondsToColourChange: 20, rinsedClean: true },
				rules
			).effect
		).toBe('none');
	});

	it('a slow change or one that did not rinse clean raises one step, capped', () => {
		expect(
			applyTestSpot(
				3,
				shingle,
				{ strengthPct: 3, secondsToColourChange: 120, rinsedClean: true },
				rules
			)
		).toMatchObject({
			strengthPct: 4,
			effect: 'raised',
			capped: false
		});
		expect(
			applyTestSpot(
				4,
				shingle,
				{ strengthPct: 4, secondsToColourChange: 30, rinsedClean: false },
				rules
			)
		).toMatchObject({
			strengthPct: 5,
			effect: 'raised'
		});
		expect(
			applyTestSpot(
				5,
				shingle,
				{ strengthPct: 5, secondsToColourChange: 200, rinsedClean: true },
				rules
			)
		).toMatchObject({
			strengthPct: 5,
			effect: 'raised',
			capped: true
		});
		// between quick and slow: no change
		expect(
			applyTestSpot(
				4,
				shingle,
				{ strengthPct: 4, secondsToColourChange: 60, rinsedClean: true },
				rules
			).effect
		).toBe('none');
	});

	it('a slow spot adds the staining expectation; facetIds limit which facets it speaks for', () => {
		const facets = [
			facet({ id: 'a', geometry: plane.rectFt(20, 20), growth: 'G2' }),
			facet({ id: 'b', geometry: plane.rectFt(20, 20, 40), growth: 'G2' })
		];
		const r = estimate(
			{
				facets,
				testSpot: { strengthPct: 4, secondsToColourChange: 150, rinsedClean: true, facetIds: ['b'] }
			},
			card
		);
		expect(r.facets.map((f) => f.mixStrengthPct)).toEqual([4, 5]);
		expect(r.facets[1].suggestedStrengthPct).toBe(4);
		const note = r.expectations.find((e) => e.code === 'test_spot.slow');
		expect(note?.facetIds).toEqual(['b']);
		expect(note?.message).toMatch(/faint staining/);
		expect(r.chemistry.batches).toHaveLength(2);
	});
});

describe('access grade', () => {
	it('roof access is refused on clay tile, concrete tile and slate (common practice: not walked)', () => {
		// common practice, no source: fragile tile and slate are worked from a ladder or lift
		expect([...NOT_WALKABLE].sort()).toEqual(['clay_tile', 'concrete_tile', 'slate']);
		for (const m of MATERIALS) {
			const refused = accessRefusal(m, 'roof');
			expect(refused !== null).toBe(NOT_WALKABLE.has(m));
			expect(accessRefusal(m, 'ladder')).toBeNull();
		}
		const issues = issuesOf({
			facets: [
				facet({ id: 'a', geometry: plane.rectFt(20, 20) }),
				facet({ id: 'b', geometry: plane.rectFt(20, 20, 40), material: 'slate', access: 'roof' })
			]
		});
		expect(issues).toHaveLength(1);
		expect(issues[0].path).toEqual(['facets', 1, 'access']);
		expect(issues[0].message).toMatch(/slate.*fragile/);
	});

	it('one ladder placement per 25 ft of eave on a ladder facet, at least one', () => {
		expect(ladderPlacements('ladder', 10, 25)).toBe(1);
		expect(ladderPlacements('ladder', 25, 25)).toBe(1);
		expect(ladderPlacements('ladder', 25.01, 25)).toBe(2);
		expect(ladderPlacements('ladder', 50.0000000001, 25)).toBe(2);
		expect(ladderPlacements('ladder', 80, 25)).toBe(4);
		expect(ladderPlacements('ground', 80, 25)).toBe(0);
		expect(ladderPlacements('lift', 80, 25)).toBe(0);
	});

	it('ladder facets add set-up time and a caution; lift adds the lift charge', () => {
		const facets = gableRoof().map((f) => ({ ...f, access: 'ladder' as const }));
		const r = estimate({ facets }, card);
		expect(r.facets.map((f) => f.ladderPlacements)).toEqual([2, 2]); // 40 ft eaves
		const ladder = r.labour.lineItems.find((l) => l.code === 'labour.ladder');
		expect(ladder?.hours).toBeCloseTo((4 * 10) / 60, 12);
		expect(r.warnings.map((w) => w.code)).toContain('safety.ladder');

		const lifted = estimate(
			{ facets: gableRoof().map((f) => ({ ...f, access: 'lift' as const })) },
			card
		);
		expect(lifted.price.lineItems.filter((l) => l.code === 'lift')).toEqual([
			expect.objectContaining({ amountCents: card.lift.chargeCents })
		]);
		expect(
			estimate({ facets: gableRoof() }, card).price.lineItems.some((l) => l.code === 'lift')
		).toBe(false);
	});

	it('access and storey multipliers come from the card for both labour and price', () => {
		const base = estimate({ facets: gableRoof() }, card);
		const two = estimate({ facets: gableRoof().map((f) => ({ ...f, stories: 2 as const })) }, card);
		const app = (r: typeof base) =>
			r.labour.lineItems.find((l) => l.code === 'labour.application')!.hours;
		expect(app(two) / app(base)).toBeCloseTo(card.stories['2'].labourMultiplier, 12);
		expect(two.facets[0].priceCents / base.facets[0].priceCents).toBeCloseTo(
			card.stories['2'].priceMultiplier,
			3
		);
		const c = cloneRateCard();
		c.stories['2'].labourMultiplier = 2;
		const two2 = estimate({ facets: gableRoof().map((f) => ({ ...f, stories: 2 as const })) }, c);
		expect(app(two2) / app(base)).toBeCloseTo(2, 12);
	});
});

describe('materials', () => {
	it('clay and concrete tile carry the batch-colour expectation (common practice)', () => {
		// common practice, no source (docs/estimating-model.md §4, proposal caveats)
		const r = estimate(
			{
				facets: [
					facet({ id: 'a', geometry: plane.rectFt(20, 20), material: 'clay_tile' }),
					facet({ id: 'b', geometry: plane.rectFt(20, 20, 40), material: 'concrete_tile' }),
					facet({ id: 'c', geometry: plane.rectFt(20, 20, 80), material: 'metal' })
				]
			},
			card
		);
		const note = r.expectations.find((e) => e.code === 'material.tile_batch');
		expect(note?.facetIds).toEqual(['a', 'b']);
		expect(note?.message).toMatch(/another batch/);
		expect(r.warnings.find((w) => w.code === 'material.metal')?.facetIds).toEqual(['c']);
	});
});
