// Pricing ticked extras the way the estimating model prices its lines (src/lib/estimating/
// pricing.ts): pre-tax lines, tax as a percentage of them, the deposit as a percentage of the
// total, each rounded once to the cent, halves away from zero. A deposit of a fixed share of the
// price is common practice in the trade, with no published source; the 25% is the demo default.
import { describe, expect, it } from 'vitest';
import { priceWithExtras } from '../../../src/lib/proposal/price';
import { isPastValidity } from '../../../src/lib/proposal/status';
import { noteText, scopeLine } from '../../../src/lib/server/proposals/snapshot';

const offer = {
	totalCents: 77_637,
	depositPct: 25,
	taxPct: 6.5,
	extras: [
		{ code: 'gutter_brightening', label: 'Gutter brightening', detail: '', priceCents: 13_779 },
		{ code: 'siding_post_rinse', label: 'Post-rinse of siding', detail: '', priceCents: 8_268 }
	]
};

describe('priceWithExtras', () => {
	it('adds the ticked extras, their tax and the deposit of the new total, to the cent', () => {
		const p = priceWithExtras(offer, ['gutter_brightening']);
		// 6.5% of $137.79 = $8.95635 → $8.96; total $776.37 + $137.79 + $8.96 = $923.12;
		// 25% of it = $230.78.
		expect(p).toMatchObject({
			extrasCents: 13_779,
			extrasTaxCents: 896,
			totalCents: 92_312,
			depositCents: 23_078
		});
	});

	it('with nothing ticked gives the proposal as sent', () => {
		// 25% of $776.37 = $194.0925 → $194.09, as the estimate's own deposit.
		expect(priceWithExtras(offer, [])).toMatchObject({ totalCents: 77_637, depositCents: 19_409 });
	});

	it('reads codes only: an unknown or repeated code adds nothing', () => {
		const p = priceWithExtras(offer, ['free_roof', 'siding_post_rinse', 'siding_post_rinse']);
		expect(p.extras).toEqual([
			{ code: 'siding_post_rinse', label: 'Post-rinse of siding', priceCents: 8_268 }
		]);
		// 6.5% of $82.68 = $5.3742 → $5.37.
		expect(p.totalCents).toBe(77_637 + 8_268 + 537);
	});
});

describe('validity', () => {
	it('holds through the last day and ends after it (UTC)', () => {
		expect(isPastValidity('2027-01-02', new Date('2027-01-02T23:59:59Z'))).toBe(false);
		expect(isPastValidity('2027-01-02', new Date('2027-01-03T00:00:00Z'))).toBe(true);
	});
});

describe('the words a customer reads', () => {
	it('names facets by label, or by place, never by id', () => {
		const names = new Map([
			['f-7c1e', 'North slope'],
			['f-99aa', 'Facet 2']
		]);
		const text = noteText(
			{
				code: 'x',
				message: 'heavy growth may leave faint staining.',
				facetIds: ['f-7c1e', 'f-99aa']
			},
			names
		);
		expect(text).toBe('Heavy growth may leave faint staining (North slope, Facet 2).');
		expect(text).not.toMatch(/f-7c1e|f-99aa/);
	});

	it('says what a facet is and how it is reached in plain words', () => {
		const line = scopeLine(
			{
				id: 'f-1',
				material: 'clay_tile',
				growth: 'G3',
				access: 'ladder',
				stories: 2,
				pitch: 5,
				squares: 12.345,
				applications: 2
			} as Parameters<typeof scopeLine>[0],
			0
		);
		expect(line).toEqual({
			facet: 'Facet 1',
			text: '12.3 squares of clay tile at a 5/12 pitch, 2 stories up; heavy growth with lichen colonies (G3). Soft wash, 2 applications, worked from ladders.'
		});
	});
});
