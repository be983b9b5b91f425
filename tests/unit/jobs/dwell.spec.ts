// The crew sheet's dwell limit: the rate card's setting, never over the trade's ceiling of
// "≤ 12–15 min" a coat (common practice, no outside source; docs/estimating-model.md, growth
// grades). The product label may allow less; the sheet says so in words beside the figure.
import { describe, expect, it } from 'vitest';
import { estimate } from '../../../src/lib/estimating';
import {
	cloneRateCard,
	DEFAULT_RATE_CARD,
	DWELL_CAP_MINUTES,
	upgradeRateCard,
	type RateCard
} from '../../../src/lib/estimating/rate-card';
import { dwellLimitMinutes } from '../../../src/lib/jobs/sheet';
import { rateCardSchema } from '../../../src/lib/schemas/rate-card';
import { gableRoof } from '../estimating/fixtures';

describe('dwell limit from the rate card', () => {
	it('is 15 min a coat on the default card (common practice, no outside source)', () => {
		expect(DWELL_CAP_MINUTES).toBe(15);
		expect(DEFAULT_RATE_CARD.chemistry.dwellMinutes).toBe(15);
		expect(estimate({ facets: gableRoof() }, DEFAULT_RATE_CARD).chemistry.dwellMinutes).toBe(15);
	});

	it("carries the owner's shorter setting into the priced result and the sheet", () => {
		const card = cloneRateCard();
		card.chemistry.dwellMinutes = 10;
		const result = estimate({ facets: gableRoof() }, card);
		expect(result.chemistry.dwellMinutes).toBe(10);
		expect(dwellLimitMinutes(result.chemistry)).toBe(10);
	});

	it('never shows more than the ceiling, and a result priced before the setting shows 15', () => {
		expect(dwellLimitMinutes({ dwellMinutes: 40 })).toBe(15);
		expect(dwellLimitMinutes({})).toBe(15);
	});

	it('refuses a setting over 15 min or under 1 min with a message naming the field', () => {
		for (const bad of [20, 0, Number.NaN]) {
			const card = cloneRateCard();
			card.chemistry.dwellMinutes = bad;
			const r = rateCardSchema.safeParse(card);
			expect(r.success).toBe(false);
			expect(r.error?.issues[0].path).toEqual(['chemistry', 'dwellMinutes']);
			expect(r.error?.issues[0].message).toMatch(/^dwellMinutes must be/);
		}
	});

	it('gives a card saved before the setting existed the ceiling, in the schema and on read', () => {
		const { dwellMinutes: _dropped, ...chemistry } = cloneRateCard().chemistry;
		const old = { ...cloneRateCard(), chemistry } as unknown as RateCard;
		const parsed = rateCardSchema.parse(old);
		expect(parsed.chemistry.dwellMinutes).toBe(15);
		expect(upgradeRateCard(old).chemistry.dwellMinutes).toBe(15);
		const kept = cloneRateCard();
		kept.chemistry.dwellMinutes = 12;
		expect(upgradeRateCard(kept).chemistry.dwellMinutes).toBe(12);
	});
});
