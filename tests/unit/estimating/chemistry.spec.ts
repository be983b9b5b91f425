import { describe, expect, it } from 'vitest';
import { buildBatches, stockVolume, waterForSite } from '../../../src/lib/estimating/chemistry';
import {
	cloneRateCard,
	DEFAULT_RATE_CARD,
	estimate,
	EstimateInputError
} from '../../../src/lib/estimating';
import { facet, gableRoof, localPlane, WRENFIELD } from './fixtures';

// Worked values: docs/estimating-model.md §13 "Worked values", W5–W8: the dilution table
// C1·V1 = C2·V2 (target × batch, from 12.5% pool chlorine, 10%, 8.25% and 6% household bleach;
// stock strengths as sold: see the page's §6.1 and its references). Published to 0.1, so ±0.1.
const TABLE: Array<[targetPct: number, batch: number, byStock: Record<number, number>]> = [
	[4, 100, { 12.5: 32.0, 10: 40.0, 8.25: 48.5, 6: 66.7 }],
	[5, 100, { 12.5: 40.0, 10: 50.0, 8.25: 60.6, 6: 83.3 }],
	[3, 100, { 12.5: 24.0, 10: 30.0, 8.25: 36.4, 6: 50.0 }],
	[4, 400, { 12.5: 128, 10: 160, 8.25: 193.9, 6: 266.7 }] // litres: C1V1 holds in any volume unit
];

const noExtras = () => {
	const chem = cloneRateCard().chemistry;
	chem.wastePct = 0;
	chem.surfactantOzPerGal = 0;
	return chem;
};

describe('dilution by C1·V1 = C2·V2', () => {
	for (const [target, batch, byStock] of TABLE) {
		for (const [stock, expected] of Object.entries(byStock)) {
			it(`${target}% × ${batch} from ${stock}% stock → ${expected}`, () => {
				// Source: docs/estimating-model.md §13 W5–W8 (dilution table), ±0.1
				expect(Math.abs(stockVolume(target, batch, Number(stock)) - expected)).toBeLessThanOrEqual(
					0.1
				);
				const { batches } = buildBatches(
					[{ id: 'x', mixStrengthPct: target, mixGal: batch }],
					Number(stock),
					noExtras()
				);
				expect(Math.abs(batches[0].stockGal - expected)).toBeLessThanOrEqual(0.1);
				expect(batches[0].stockGal + batches[0].waterGal).toBeCloseTo(batch, 9);
			});
		}
	}

	it('4% × 100 gal from 12.5% is 32.0 gal of stock and 68 gal of water', () => {
		// Source: docs/estimating-model.md §13 W5 ("32.0 gal of 12.5% stock + 68 gal")
		const { batches } = buildBatches(
			[{ id: 'x', mixStrengthPct: 4, mixGal: 100 }],
			12.5,
			noExtras()
		);
		expect(batches[0].stockGal).toBeCloseTo(32, 9);
		expect(batches[0].waterGal).toBeCloseTo(68, 9);
	});

	it('stock that re-tests at 11% needs 36.4 gal for 4% × 100 gal', () => {
		// Source: docs/estimating-model.md §13 W9 (common practice: re-test each lot and mix from
		// the measured strength; 4 × 100 ÷ 11 = 36.36, published to 0.1)
		expect(Math.abs(stockVolume(4, 100, 11) - 36.4)).toBeLessThanOrEqual(0.05);
		const { batches } = buildBatches([{ id: 'x', mixStrengthPct: 4, mixGal: 100 }], 11, noExtras());
		expect(Math.abs(batches[0].stockGal - 36.4)).toBeLessThanOrEqual(0.05);
		expect(Math.abs(batches[0].waterGal - 63.6)).toBeLessThanOrEqual(0.05);
	});

	it('1 part 12.5% stock to 1 part water ("50/50") is a 6.25% mix', () => {
		// Source: docs/estimating-model.md §13 W10 (1:1 from 12.5% → 6.25%). The code must ask
		// for exactly one part of stock to one of water for a 6.25% mix from 12.5% stock.
		const { batches } = buildBatches(
			[{ id: 'x', mixStrengthPct: 6.25, mixGal: 2 }],
			12.5,
			noExtras()
		);
		expect(batches[0].stockGal).toBeCloseTo(1, 12);
		expect(batches[0].waterGal).toBeCloseTo(1, 12);
	});

	it("ARMA's 1 part household bleach to 1 part water is a 2.6–4.1% mix", () => {
		// Source: ARMA technical bulletin "Algae Discoloration of Roofs" (1 part bleach : 1 part
		// water); docs/estimating-model.md §13 W11: from 5.25% → 2.6%, from 8.25% → 4.1%.
		// The published strengths are rounded to 0.1 point, so one part comes back to ±2%.
		for (const [stock, mix] of [
			[5.25, 2.6],
			[8.25, 4.1]
		] as const) {
			const { batches } = buildBatches(
				[{ id: 'x', mixStrengthPct: mix, mixGal: 2 }],
				stock,
				noExtras()
			);
			expect(Math.abs(batches[0].stockGal - 1)).toBeLessThanOrEqual(0.02);
			expect(Math.abs(batches[0].waterGal - 1)).toBeLessThanOrEqual(0.02);
		}
	});

	it('the UF extension mix, 1 part 5.25% chlorine bleach to 10 parts water, is 0.48%', () => {
		// Source: V. Peart, "Algae Growth on Roofs", Univ. of Florida Cooperative Extension
		// (1 part to 10 parts water); docs/estimating-model.md §13 W12: 1/11 of 5.25% = 0.48%.
		// 0.48 is rounded to 0.01 point (of 0.477), so one part of 11 comes back to ±1.1%.
		const { batches } = buildBatches(
			[{ id: 'x', mixStrengthPct: 0.48, mixGal: 11 }],
			5.25,
			noExtras()
		);
		expect(Math.abs(batches[0].stockGal - 1)).toBeLessThanOrEqual(0.011);
		expect(Math.abs(batches[0].waterGal - 10)).toBeLessThanOrEqual(0.011);
		expect(Math.abs(stockVolume(0.48, 11, 5.25) - 1)).toBeLessThanOrEqual(0.011);
	});
});

describe('batches, waste and surfactant', () => {
	it('one batch per distinct strength (common practice: a premix tank holds one strength)', () => {
		// common practice, no source
		const card = DEFAULT_RATE_CARD;
		const { batches } = buildBatches(
			[
				{ id: 'a', mixStrengthPct: 4, mixGal: 10 },
				{ id: 'b', mixStrengthPct: 3, mixGal: 5 },
				{ id: 'c', mixStrengthPct: 3 + 1, mixGal: 20 },
				{ id: 'd', mixStrengthPct: 0.1 + 0.2 + 2.7, mixGal: 1 }
			],
			12.5,
			card.chemistry
		);
		expect(batches.map((b) => b.strengthPct)).toEqual([3, 4]);
		expect(batches[0].facetIds).toEqual(['b', 'd']);
		expect(batches[1].facetIds).toEqual(['a', 'c']);
		expect(batches[1].mixGal).toBeCloseTo(30 * 1.1, 9);
	});

	it('adds the waste allowance, doses surfactant per gallon and takes water by difference', () => {
		const chem = cloneRateCard().chemistry; // waste 10%, 1 fl oz/gal
		const { batches } = buildBatches([{ id: 'a', mixStrengthPct: 4, mixGal: 100 }], 12.5, chem);
		const b = batches[0];
		expect(b.mixGal).toBeCloseTo(110, 9);
		expect(b.stockGal).toBeCloseTo(35.2, 9);
		expect(b.surfactantOz).toBeCloseTo(110, 9);
		expect(b.stockGal + b.waterGal + b.surfactantOz / 128).toBeCloseTo(b.mixGal, 9);
		// and the mix really is 4%: stock strength × stock volume ÷ batch volume
		expect((12.5 * b.stockGal) / b.mixGal).toBeCloseTo(4, 12);
	});

	it('a mix as strong as the stock, or stronger, cannot be made', () => {
		const chem = noExtras();
		const r = buildBatches([{ id: 'a', mixStrengthPct: 5, mixGal: 10 }], 5, chem);
		expect(r.batches).toHaveLength(0);
		expect(r.problems[0].message).toMatch(/stock must be stronger/);
		expect(
			buildBatches([{ id: 'a', mixStrengthPct: 5, mixGal: 10 }], 4, chem).problems
		).toHaveLength(1);
	});

	it('estimate() refuses stock weaker than the mix, naming stockStrengthPct', () => {
		const facets = gableRoof();
		let err: unknown;
		try {
			estimate({ facets, stockStrengthPct: 2.5 }, DEFAULT_RATE_CARD);
		} catch (e) {
			err = e;
		}
		expect(err).toBeInstanceOf(EstimateInputError);
		const issue = (err as EstimateInputError).issues[0];
		expect(issue.path).toEqual(['stockStrengthPct']);
		expect(issue.code).toBe('stock_too_weak');
		expect(issue.message).toMatch(/3% mix cannot be made from 2.5% stock/);
	});

	it('warns when the stated stock is stronger than sodium hypochlorite is sold', () => {
		const r = estimate({ facets: gableRoof(), stockStrengthPct: 40 }, DEFAULT_RATE_CARD);
		expect(r.warnings.map((w) => w.code)).toContain('chemistry.stock_unusual');
		expect(
			estimate({ facets: gableRoof() }, DEFAULT_RATE_CARD).warnings.map((w) => w.code)
		).not.toContain('chemistry.stock_unusual');
	});

	it('the model mixes from the tested stock: 11% needs 12.5/11 as much as 12.5%', () => {
		const facets = gableRoof();
		const fresh = estimate({ facets }, DEFAULT_RATE_CARD).chemistry;
		const aged = estimate({ facets, stockStrengthPct: 11 }, DEFAULT_RATE_CARD).chemistry;
		expect(fresh.stockStrengthPct).toBe(12.5);
		expect(aged.totalStockGal / fresh.totalStockGal).toBeCloseTo(12.5 / 11, 12);
		expect(aged.totalMixGal).toBeCloseTo(fresh.totalMixGal, 12);
	});

	it('mix = Σ squares × coverage × applications (+ waste)', () => {
		const plane = localPlane(WRENFIELD.lat, WRENFIELD.lon);
		const r = estimate(
			{
				facets: [
					facet({ id: 'a', geometry: plane.rectFt(40, 30), pitch: 0, growth: 'G3' }),
					facet({ id: 'b', geometry: plane.rectFt(20, 10, 60, 0), pitch: 0, material: 'metal' })
				]
			},
			DEFAULT_RATE_CARD
		);
		// 12 squares × 1.5 gal × 2 applications + 2 squares × 0.75 gal × 1
		expect(r.facets[0].mixGal).toBeCloseTo(36, 4);
		expect(r.facets[1].mixGal).toBeCloseTo(1.5, 4);
		expect(r.chemistry.totalMixGal).toBeCloseTo(37.5 * 1.1, 4);
		expect(r.chemistry.batches.map((b) => [b.strengthPct, b.facetIds])).toEqual([
			[2, ['b']],
			[5, ['a']]
		]);
	});
});

describe('pre-wet and rinse water', () => {
	it('scales with eave length; no gutters multiplies pre-wet and warns about runoff', () => {
		const chem = DEFAULT_RATE_CARD.chemistry;
		expect(waterForSite(80, chem, false)).toEqual({ preWetGal: 40, rinseGal: 40 });
		expect(waterForSite(80, chem, true)).toEqual({ preWetGal: 80, rinseGal: 40 });
		const facets = gableRoof();
		const plain = estimate({ facets }, DEFAULT_RATE_CARD);
		const bare = estimate({ facets, siteFlags: { noGutters: true } }, DEFAULT_RATE_CARD);
		expect(plain.totals.eaveLengthFt).toBeCloseTo(80, 4);
		expect(plain.chemistry.preWetGal).toBeCloseTo(40, 4);
		expect(bare.chemistry.preWetGal).toBeCloseTo(80, 4);
		const w = bare.warnings.find((x) => x.code === 'site.no_gutters');
		expect(w?.message).toMatch(/storm drains/);
		expect(plain.warnings.find((x) => x.code === 'site.no_gutters')).toBeUndefined();
	});
});
