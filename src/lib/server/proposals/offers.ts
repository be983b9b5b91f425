import { roundCents } from '../../estimating/money';
import type { EstimateResult } from '../../estimating/types';
import type { OfferedExtra } from '../../proposal/types';

/**
 * Optional extras every proposal offers, priced from the measured roof. Demo defaults, from
 * memory, not advice: gutter brightening by the foot of eave (the gutter run), siding post-rinse
 * by the foot of eave per story of wall below it, each with a minimum.
 */
export const OFFER_RATES = {
	gutterCentsPerFt: 150, // demo default, from memory
	gutterMinimumCents: 9_900, // demo default, from memory
	sidingCentsPerFtPerStory: 90, // demo default, from memory
	sidingMinimumCents: 7_500 // demo default, from memory
} as const;

export function offeredExtras(
	r: EstimateResult,
	site: { noGutters?: boolean },
	rates = OFFER_RATES
): OfferedExtra[] {
	const eaveFt = r.totals.eaveLengthFt;
	const stories = Math.max(1, ...r.facets.map((f) => f.stories));
	const feet = Math.round(eaveFt);
	const out: OfferedExtra[] = [];
	if (!site.noGutters) {
		out.push({
			code: 'gutter_brightening',
			label: 'Gutter brightening',
			detail: `The outside faces of the gutters cleaned of black streaks and oxidation (about ${feet} ft).`,
			priceCents: Math.max(rates.gutterMinimumCents, roundCents(eaveFt * rates.gutterCentsPerFt))
		});
	}
	out.push({
		code: 'siding_post_rinse',
		label: 'Post-rinse of siding',
		detail: `The walls below the roof rinsed with clean water after the wash (about ${feet} ft of wall, ${stories} ${stories === 1 ? 'story' : 'stories'}).`,
		priceCents: Math.max(
			rates.sidingMinimumCents,
			roundCents(eaveFt * stories * rates.sidingCentsPerFtPerStory)
		)
	});
	return out;
}
