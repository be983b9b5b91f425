import { describe, expect, it } from 'vitest';
import {
	hipValleyFactor,
	pitchAngleDeg,
	pitchMultiplier,
	rafterInchesPerFootRun
} from '../../../src/lib/estimating/pitch';
import { estimate, DEFAULT_RATE_CARD } from '../../../src/lib/estimating';
import { measureFacetPlan } from '../../../src/lib/estimating/geometry';
import { facet, localPlane } from './fixtures';

// Source: JLC (Journal of Light Construction), "Asphalt Shingles Field Guide", slope and
// hip/valley factor table (rise/12: slope, hip-valley), listed in docs/estimating-model.md §13 W3.
const JLC_TABLE: Array<[rise: number, slope: number, hipValley: number]> = [
	[4, 1.054, 1.452],
	[5, 1.083, 1.474],
	[6, 1.118, 1.5],
	[7, 1.157, 1.524], // JLC prints 1.524; the formula gives 1.5298, a typo in the table
	[8, 1.202, 1.564],
	[9, 1.25, 1.6],
	[10, 1.302, 1.642],
	[11, 1.356, 1.684],
	[12, 1.414, 1.732]
];

// Formula values m = √(1+(rise/12)²) and hip = √(2+(rise/12)²) to 5 decimals
// (docs/estimating-model.md §2 and §13 W3).
const FORMULA_TABLE: Array<[rise: number, slope: number, hipValley: number, angleDeg: number]> = [
	[1, 1.00347, 1.41667, 4.76],
	[2, 1.01379, 1.424, 9.46],
	[3, 1.03078, 1.43614, 14.04],
	[4, 1.05409, 1.45297, 18.43],
	[5, 1.08333, 1.47432, 22.62],
	[6, 1.11803, 1.5, 26.57],
	[7, 1.1577, 1.5298, 30.26],
	[8, 1.20185, 1.56347, 33.69],
	[9, 1.25, 1.60078, 36.87],
	[10, 1.30171, 1.64148, 39.81],
	[11, 1.35657, 1.68531, 42.51],
	[12, 1.41421, 1.73205, 45.0]
];

describe('pitch multiplier', () => {
	it.each(JLC_TABLE)('%i/12 matches the JLC field-guide slope column to ±0.001', (rise, slope) => {
		// Source: JLC "Asphalt Shingles Field Guide" (truncated to 3 decimals, hence ±0.001)
		expect(Math.abs(pitchMultiplier(rise) - slope)).toBeLessThanOrEqual(0.001);
	});

	it.each(JLC_TABLE)('%i/12 hip/valley factor matches JLC to ±0.007', (rise, _s, hip) => {
		// Source: JLC "Asphalt Shingles Field Guide"; ±0.007 covers its 7/12 typo (1.524 vs 1.530)
		expect(Math.abs(hipValleyFactor(rise) - hip)).toBeLessThanOrEqual(0.007);
	});

	it.each(FORMULA_TABLE)('%i/12 matches √(1+(rise/12)²) to 1e-5', (rise, slope, hip, angle) => {
		// Source: docs/estimating-model.md §13 W3 (5-decimal formula values); I.S. Griffith,
		// Carpentry (1916), "Determining length of hip or valley rafter"
		expect(Math.abs(pitchMultiplier(rise) - slope)).toBeLessThanOrEqual(1e-5);
		expect(Math.abs(hipValleyFactor(rise) - hip)).toBeLessThanOrEqual(1e-5);
		expect(Math.abs(pitchAngleDeg(rise) - angle)).toBeLessThanOrEqual(0.005);
	});

	it('is 1 for a flat roof and 1/cos θ in general', () => {
		expect(pitchMultiplier(0)).toBe(1);
		for (const rise of [0.5, 3, 7.25, 18, 24]) {
			const theta = Math.atan(rise / 12);
			expect(pitchMultiplier(rise)).toBeCloseTo(1 / Math.cos(theta), 12);
		}
	});

	it('framing-square rafter table: 13 → 17.69 in, 16 → 20.00 in per foot of run', () => {
		// Source: US Army Engineer School subcourse EN0069, framing-square rafter table
		expect(rafterInchesPerFootRun(13)).toBeCloseTo(17.69, 2);
		expect(rafterInchesPerFootRun(16)).toBeCloseTo(20.0, 2);
		// and the 12·m column of docs/estimating-model.md §13 W3
		expect(rafterInchesPerFootRun(6)).toBeCloseTo(13.42, 2);
		expect(rafterInchesPerFootRun(12)).toBeCloseTo(16.97, 2);
	});

	it('hip from corner to ridge over a 15 ft common run at 6/12 is 22.5 ft', () => {
		// Source: docs/estimating-model.md §13 W2 (I.S. Griffith, Carpentry (1916): the factor
		// multiplies the common run)
		expect(15 * hipValleyFactor(6)).toBeCloseTo(22.5, 10);
		// the same hip from its plan length 21.21 ft × √(1+m²/2) with m = rise/12
		const planLength = Math.hypot(15, 15);
		expect(planLength * Math.sqrt(1 + 0.5 ** 2 / 2)).toBeCloseTo(22.5, 10);
	});
});

describe('worked check: 40 × 30 ft plan at 6/12', () => {
	// Source: docs/estimating-model.md §13 W1 (JLC slope factor): 1200 × 1.11803 = 1341.6 ft²
	// = 13.42 squares.
	// The polygon is built in a local plane at 47.6° N (an arbitrary latitude) so its plan area
	// is 1200 ft² on the ellipsoid.
	const plane = localPlane(47.6, -120.3);
	const polygon = plane.rectFt(40, 30);

	it('plan area is 1200 ft² and the perimeter 140 ft', () => {
		const r = measureFacetPlan(polygon);
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(r.plan.planAreaFt2).toBeCloseTo(1200, 3);
		expect(r.plan.perimeterFt).toBeCloseTo(140, 3);
	});

	it('the model gives 1341.6 ft² sloped and 13.42 squares', () => {
		const res = estimate({ facets: [facet({ geometry: polygon, pitch: 6 })] }, DEFAULT_RATE_CARD);
		const f = res.facets[0];
		expect(f.pitchMultiplier).toBeCloseTo(1.11803, 5);
		expect(Math.abs(f.slopedAreaFt2 - 1341.6)).toBeLessThan(0.05);
		expect(Math.abs(f.squares - 13.42)).toBeLessThan(0.005);
		// a hip roof on the same plan has the same area: split into 4 facets at 6/12
		const hip = estimate(
			{
				facets: [
					facet({
						id: 'n',
						geometry: plane.polygonFt([
							[-20, 15],
							[-5, 0],
							[5, 0],
							[20, 15]
						])
					}),
					facet({
						id: 's',
						geometry: plane.polygonFt([
							[-20, -15],
							[20, -15],
							[5, 0],
							[-5, 0]
						])
					}),
					facet({
						id: 'e',
						geometry: plane.polygonFt([
							[20, -15],
							[20, 15],
							[5, 0]
						])
					}),
					facet({
						id: 'w',
						geometry: plane.polygonFt([
							[-20, -15],
							[-5, 0],
							[-20, 15]
						])
					})
				]
			},
			DEFAULT_RATE_CARD
		);
		expect(Math.abs(hip.totals.slopedAreaFt2 - 1341.6)).toBeLessThan(0.05);
		expect(hip.totals.planAreaFt2).toBeCloseTo(1200, 3);
	});
});
