// The crew re-tests the stock on the day and the batch recipes follow the measured strength.
// Worked values: docs/estimating-model.md §13 W5–W9 (the dilution table C1·V1 = C2·V2 from the
// stock strengths as sold, published to 0.1; W9, stock re-tested at 11%, common practice: re-test
// each lot and mix from the measured strength).
import { describe, expect, it } from 'vitest';
import { buildBatches, rebatchForStock } from '../../../src/lib/estimating/chemistry';
import { cloneRateCard } from '../../../src/lib/estimating';

const plain = () => {
	const chem = cloneRateCard().chemistry;
	chem.wastePct = 0;
	chem.surfactantOzPerGal = 0;
	return chem;
};

/** 4% × 100 gal planned from the card's 12.5% stock (W5: 32.0 gal of stock + 68 gal of water). */
const planned = () =>
	buildBatches([{ id: 'f1', mixStrengthPct: 4, mixGal: 100 }], 12.5, plain()).batches;

describe('batch recipes recomputed for the stock strength measured on the day', () => {
	it('W5 as planned: 32.0 gal of 12.5% stock for 4% × 100 gal', () => {
		// Source: docs/estimating-model.md §13 W5
		expect(planned()[0].stockGal).toBeCloseTo(32, 9);
	});

	for (const [measured, stock] of [
		[10, 40.0],
		[8.25, 48.5],
		[6, 66.7]
	] as const) {
		it(`stock measured at ${measured}% → ${stock} gal for 4% × 100 gal (W5 row)`, () => {
			// Source: docs/estimating-model.md §13 W5 (from 10%, 8.25%, 6%), published to 0.1
			const { batches, problems } = rebatchForStock(planned(), measured);
			expect(problems).toEqual([]);
			expect(Math.abs(batches[0].stockGal - stock)).toBeLessThanOrEqual(0.05);
			expect(batches[0].stockGal + batches[0].waterGal).toBeCloseTo(100, 9);
		});
	}

	it('W9: stock that re-tests at 11% needs 36.4 gal and 63.6 gal of water', () => {
		// Source: docs/estimating-model.md §13 W9 (4 × 100 ÷ 11 = 36.36, published to 0.1)
		const { batches } = rebatchForStock(planned(), 11);
		expect(Math.abs(batches[0].stockGal - 36.4)).toBeLessThanOrEqual(0.05);
		expect(Math.abs(batches[0].waterGal - 63.6)).toBeLessThanOrEqual(0.05);
	});

	it('keeps the mix volume, strength, surfactant dose and facets; only stock and water move', () => {
		// C1·V1 = C2·V2 with waste and surfactant: docs/estimating-model.md §6.2–6.3
		const chem = cloneRateCard().chemistry; // waste 10 %, 1 fl oz of surfactant per gallon
		const before = buildBatches(
			[
				{ id: 'a', mixStrengthPct: 3, mixGal: 40 },
				{ id: 'b', mixStrengthPct: 5, mixGal: 60 }
			],
			12.5,
			chem
		).batches;
		const { batches } = rebatchForStock(before, 10);
		expect(batches.map((b) => [b.strengthPct, b.mixGal, b.surfactantOz, b.facetIds])).toEqual(
			before.map((b) => [b.strengthPct, b.mixGal, b.surfactantOz, b.facetIds])
		);
		for (const b of batches) {
			// The measured stock times its volume is the chlorine the finished mix must hold.
			expect((10 * b.stockGal) / b.mixGal).toBeCloseTo(b.strengthPct, 9);
			expect(b.stockGal + b.waterGal + b.surfactantOz / 128).toBeCloseTo(b.mixGal, 9);
		}
		// W6: 5% × 100 gal from 10% stock is 50.0 gal; here the batch is 66 gal (60 + 10 % waste).
		expect(batches[1].stockGal).toBeCloseTo((50.0 * 66) / 100, 9);
	});

	it('refuses a batch the measured stock can no longer make, and says why', () => {
		// A 5% mix cannot come from 4% stock: C1 must exceed C2 (docs/estimating-model.md §6.2).
		const before = buildBatches(
			[
				{ id: 'a', mixStrengthPct: 3, mixGal: 10 },
				{ id: 'b', mixStrengthPct: 5, mixGal: 10 }
			],
			12.5,
			plain()
		).batches;
		const { batches, problems } = rebatchForStock(before, 4);
		expect(batches.map((b) => b.strengthPct)).toEqual([3]);
		expect(problems).toHaveLength(1);
		expect(problems[0].facetIds).toEqual(['b']);
		expect(problems[0].message).toMatch(/5% mix cannot be made from stock measured at 4%/);
	});

	it('does not change the planned batches it was given', () => {
		const before = planned();
		const copy = structuredClone(before);
		rebatchForStock(before, 8.25);
		expect(before).toEqual(copy);
	});
});
