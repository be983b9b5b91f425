import type { GrowthRate, MaterialRate, RateCard } from './rate-card';
import type { TestSpot } from './types';

/** Strength values are compared and grouped at this resolution (percentage points). */
const STRENGTH_EPS = 1e-9;

export const clampStrength = (pct: number, m: MaterialRate): number =>
	Math.min(m.maxStrengthPct, Math.max(m.minStrengthPct, pct));

/** Base strength for the material plus the grade's step, floored and capped by the material. */
export function suggestStrength(m: MaterialRate, g: GrowthRate): number {
	return clampStrength(m.baseStrengthPct + g.strengthStepPct, m);
}

export type TestSpotEffect = 'none' | 'lowered' | 'raised';

export interface StrengthDecision {
	suggestedPct: number;
	strengthPct: number;
	effect: TestSpotEffect;
	/** The test spot asked for more than the material's maximum allows. */
	capped: boolean;
}

/**
 * A quick, clean colour change at or below the suggested strength shows the growth gives way
 * easily: one step down, but never below what was tested nor the material's minimum. A slow
 * change, or one that did not rinse clean, raises one step, still capped by the material.
 * Thresholds come from the rate card (common practice: a ~5% test spot that changes colour in
 * ~30–45 s cleans without pressure; docs/estimating-model.md §4).
 */
export function applyTestSpot(
	suggestedPct: number,
	m: MaterialRate,
	spot: TestSpot | undefined,
	rules: RateCard['testSpot']
): StrengthDecision {
	const none: StrengthDecision = {
		suggestedPct,
		strengthPct: suggestedPct,
		effect: 'none',
		capped: false
	};
	if (!spot) return none;
	const slow = spot.secondsToColourChange > rules.slowSeconds || !spot.rinsedClean;
	if (slow) {
		const wanted = suggestedPct + rules.adjustStepPct;
		const strengthPct = clampStrength(wanted, m);
		return {
			suggestedPct,
			strengthPct,
			effect: 'raised',
			capped: strengthPct < wanted - STRENGTH_EPS
		};
	}
	const quick =
		spot.secondsToColourChange <= rules.quickSeconds &&
		spot.strengthPct <= suggestedPct + STRENGTH_EPS;
	if (quick) {
		const lowered = Math.max(suggestedPct - rules.adjustStepPct, spot.strengthPct);
		const strengthPct = clampStrength(lowered, m);
		if (strengthPct < suggestedPct - STRENGTH_EPS) {
			return { suggestedPct, strengthPct, effect: 'lowered', capped: false };
		}
	}
	return none;
}

/** Key that groups equal strengths despite float noise (3 + 1 vs 4). */
export const strengthKey = (pct: number): number => Math.round(pct * 1e6) / 1e6;

/** Clearpitch's own wording for the proposal's expectations section. */
export const EXPECTATIONS = {
	lichen:
		'Lichen and moss turn white once treated and then wear away with rain over the following weeks; these facets will not look finished on the day of cleaning.',
	severe:
		'Thick moss or lichen mats can lighten without coming fully clean; some faint marks may stay.',
	slowTestSpot:
		'The test spot cleared slowly or not completely: heavy growth may leave faint staining after cleaning.',
	tileBatch:
		'Tiles from another batch (earlier repairs or replacements) may not match the original colour after cleaning.'
} as const;
