// Live plan measurements (src/lib/map/plan-measure.ts) against outside references.
import { describe, expect, it } from 'vitest';
import { measureFacet, measurePlan, PlanMeasurer } from '../../../src/lib/map/plan-measure';
import { facetsOf, houses } from '../../../geodata/scene';
import { FT2_PER_M2, geodesicAreaM2, rectangleM } from './reference';

const FT = 0.3048;

describe('measureFacet', () => {
	it('reproduces the worked gable check: 40 ft × 30 ft at 6/12 → 1341.6 ft², 13.42 squares', () => {
		// Source: docs/estimating-model.md §13 W1 (1200 × 1.11803; slope factor as in the JLC
		// "Asphalt Shingles Field Guide" table). Rectangle placed with GeographicLib at an
		// invented spot (Wrenfield is invented).
		const geometry = rectangleM(35.52, -74.46, 40 * FT, 30 * FT);
		const m = measureFacet({ id: 'g', geometry, pitch: 6 });
		if (!m.ok) throw new Error(m.problem);
		expect(m.planAreaFt2).toBeCloseTo(1200, 2);
		expect(m.pitchMultiplier).toBeCloseTo(1.11803, 5);
		expect(m.slopedAreaFt2).toBeCloseTo(1341.6, 1);
		expect(m.squares).toBeCloseTo(13.42, 2);
		expect(m.perimeterFt).toBeCloseTo(140, 3);
	});

	it('measures labelled eaves exactly and estimates them when none is labelled', () => {
		const geometry = rectangleM(35.52, -74.46, 40 * FT, 30 * FT);
		const labelled = measureFacet({
			id: 'g',
			geometry,
			pitch: 6,
			edges: ['eave', 'rake', 'eave', 'rake']
		});
		const bare = measureFacet({ id: 'g', geometry, pitch: 6 });
		if (!labelled.ok || !bare.ok) throw new Error('not measured');
		expect(labelled.eaveLengthFt).toBeCloseTo(80, 3);
		expect(labelled.eaveEstimated).toBe(false);
		expect(bare.eaveLengthFt).toBeCloseTo(40, 3);
		expect(bare.eaveEstimated).toBe(true);
	});

	it('reports an outline it cannot measure instead of a number', () => {
		const bowTie = {
			type: 'Polygon' as const,
			coordinates: [
				[
					[0, 0],
					[0.0001, 0.0001],
					[0.0001, 0],
					[0, 0.0001],
					[0, 0]
				]
			]
		};
		const m = measureFacet({ id: 'x', geometry: bowTie, pitch: 6 });
		expect(m.ok).toBe(false);
		if (!m.ok) expect(m.problem).toMatch(/crosses itself/);
	});
});

describe('measurePlan on the sample scene', () => {
	// Truth: geodata/scene.geojson, whose areas come from GeographicLib; each facet is also
	// measured here with geographiclib-geodesic directly.
	for (const h of houses()) {
		it(`${h.properties.houseId} (${h.properties.roofType}) matches the scene to 0.001%`, () => {
			const facets = facetsOf(h.properties.houseId).map((f) => ({
				id: f.properties.facetId,
				geometry: f.geometry,
				pitch: f.properties.pitch,
				edges: f.properties.edges
			}));
			const { facets: ms, totals } = measurePlan(facets);
			facets.forEach((f, i) => {
				const m = ms[i];
				if (!m.ok) throw new Error(m.problem);
				const ref = geodesicAreaM2(f.geometry) * FT2_PER_M2;
				expect(Math.abs(m.planAreaFt2 - ref) / ref).toBeLessThan(1e-5);
			});
			expect(
				Math.abs(totals.planAreaFt2 - h.properties.planAreaFt2) / h.properties.planAreaFt2
			).toBeLessThan(1e-5);
			expect(
				Math.abs(totals.slopedAreaFt2 - h.properties.slopedAreaFt2) / h.properties.slopedAreaFt2
			).toBeLessThan(1e-5);
			expect(totals.squares).toBeCloseTo(h.properties.squares, 3);
			expect(
				Math.abs(totals.eaveLengthFt - h.properties.eaveLengthFt) / h.properties.eaveLengthFt
			).toBeLessThan(1e-5);
		});
	}
});

describe('PlanMeasurer', () => {
	it('gives the same answers as a full measurement, and re-measures what changed', () => {
		const facets = facetsOf('h04').map((f) => ({
			id: f.properties.facetId,
			geometry: f.geometry,
			pitch: f.properties.pitch
		}));
		const pm = new PlanMeasurer();
		const first = pm.measure(facets);
		expect(first).toEqual(measurePlan(facets));
		const steeper = facets.map((f, i) => (i === 2 ? { ...f, pitch: 12 } : f));
		const second = pm.measure(steeper);
		expect(second).toEqual(measurePlan(steeper));
		expect(second.totals.slopedAreaFt2).toBeGreaterThan(first.totals.slopedAreaFt2);
		// unchanged facets keep their measurement object
		expect(second.facets[0]).toBe(first.facets[0]);
		expect(second.facets[2]).not.toBe(first.facets[2]);
	});
});
