// The Rates page's illustrative roofs: each is the shape its name says, and prices on the
// default card. Sloped area = plan area × √(1 + (rise/12)²), the pitch multiplier from the
// definition of pitch as rise per 12 in of run (printed as "pitch factor" tables in roofing
// handbooks; 6/12 → 1.118, 5/12 → 1.083, 10/12 → 1.302).
import { describe, expect, it } from 'vitest';
import { DEFAULT_RATE_CARD, tryEstimate } from '../../../src/lib/estimating';
import { PREVIEW_ROOFS } from '../../../src/lib/rates/preview-roofs';

const PLAN_FT2: Record<string, [number, number]> = {
	'gable-shingle': [30 * 40, 6],
	'gable-tile': [24 * 36, 5],
	'gable-slate': [28 * 32, 10]
};

describe('Rates preview roofs', () => {
	it.each(PREVIEW_ROOFS.map((r) => [r.id, r] as const))(
		'%s is the shape its name gives',
		(id, roof) => {
			const [planFt2, rise] = PLAN_FT2[id];
			expect(roof.name).toContain(`at ${rise}/12`);
			const r = tryEstimate(roof.input, DEFAULT_RATE_CARD);
			if (!r.ok) throw new Error(JSON.stringify(r.issues));
			// Within 0.5 ft² of the formula: the outline is a lon/lat rectangle on the ellipsoid.
			expect(r.value.totals.planAreaFt2).toBeCloseTo(planFt2, 0);
			expect(r.value.totals.slopedAreaFt2).toBeCloseTo(
				planFt2 * Math.sqrt(1 + (rise / 12) ** 2),
				0
			);
			expect(r.value.price.totalCents).toBeGreaterThan(0);
		}
	);

	it('keeps the first roof all asphalt shingle (the Rates page test edits that rate)', () => {
		expect(PREVIEW_ROOFS[0].input.facets.every((f) => f.material === 'asphalt_shingle')).toBe(true);
	});
});
