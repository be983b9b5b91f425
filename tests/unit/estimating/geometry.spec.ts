import { kinks, area as turfArea } from '@turf/turf';
import fc from 'fast-check';
import type { Polygon } from 'geojson';
import { describe, expect, it } from 'vitest';
import {
	eaveLength,
	ellipsoidAreaCorrection,
	isStrictlyConvex,
	measureFacetPlan,
	meridionalRadius,
	primeVerticalRadius
} from '../../../src/lib/estimating/geometry';
import { Geodesic, geographicLibAreaM2, localPlane } from './fixtures';

const LATS = [-70, -60, -45, -30, 0, 30, 45, 60, 70];

/** A 15 m × 10 m rectangle and an irregular pentagon (the probe of docs/estimating-model.md W13). */
function shapes(lat: number, lon: number): Record<string, Polygon> {
	const p = localPlane(lat, lon);
	return {
		rect: p.polygonM([
			[-7.5, -5],
			[7.5, -5],
			[7.5, 5],
			[-7.5, 5]
		]),
		pentagon: p.polygonM([
			[-9, -6],
			[11, -4],
			[13, 7],
			[1, 12],
			[-10, 5]
		]),
		// a 60 m shed: the correction must hold at any facet size
		large: p.polygonM([
			[-30, -20],
			[30, -20],
			[30, 20],
			[-30, 20]
		])
	};
}

function plan(polygon: Polygon) {
	const r = measureFacetPlan(polygon);
	if (!r.ok) throw new Error(JSON.stringify(r.issues));
	return r.plan;
}

describe('plan area on the WGS84 ellipsoid vs GeographicLib', () => {
	// Reference: geographiclib-geodesic 2.2.0 (Karney 2013, J. Geodesy 87:43–55), the ellipsoidal
	// polygon area. The model must be within 0.01% (1e-4) of it at any latitude −70°..70°.
	for (const lat of LATS) {
		it(`agrees to better than 1e-4 at ${lat}°`, () => {
			for (const [name, poly] of Object.entries(shapes(lat, 3))) {
				const ref = geographicLibAreaM2(poly);
				const rel = Math.abs(plan(poly).planAreaM2 - ref) / ref;
				expect(rel, name).toBeLessThan(1e-4);
				// the M·N/R² correction is in fact good to a few ppm over a roof
				expect(rel, name).toBeLessThan(5e-6);
			}
		});
	}

	it('works across the antimeridian and for clockwise rings', () => {
		const p = localPlane(-16.8, 179.9999);
		const ring = p.polygonM([
			[-20, -10],
			[20, -10],
			[20, 10],
			[-20, 10]
		]);
		// wrap the eastern corners to −180..
		ring.coordinates[0] = ring.coordinates[0].map(([x, y]) => [x > 180 ? x - 360 : x, y]);
		expect(ring.coordinates[0].some(([x]) => x < 0)).toBe(true);
		expect(plan(ring).planAreaM2).toBeCloseTo(800, 2);
		const cw: Polygon = { type: 'Polygon', coordinates: [[...ring.coordinates[0]].reverse()] };
		expect(plan(cw).planAreaM2).toBeCloseTo(800, 2);
	});

	it('turf alone (a sphere) misses by ≈ −0.56% at 60° and +0.45% at the equator', () => {
		// Source: docs/estimating-model.md §13 W13 (@turf/area against GeographicLib, Karney 2013):
		// 149.164 vs 150.000 at 60° (−0.557%), 150.674 at 0°
		// (+0.449%); this is why the model applies M·N/R².
		const at60 = shapes(60, 3).rect;
		const rel60 = turfArea(at60) / geographicLibAreaM2(at60) - 1;
		expect(rel60).toBeGreaterThan(-0.0058);
		expect(rel60).toBeLessThan(-0.0053);
		const at0 = shapes(0, 3).rect;
		const rel0 = turfArea(at0) / geographicLibAreaM2(at0) - 1;
		expect(rel0).toBeGreaterThan(0.0043);
		expect(rel0).toBeLessThan(0.0046);
		// and the correction is exactly that ratio
		expect(ellipsoidAreaCorrection(60)).toBeCloseTo(1 / (1 + rel60), 5);
	});

	it('WGS84 radii of curvature match textbook values', () => {
		// Source: WGS84 (NIMA TR8350.2): M(0) = a(1−e²) = 6,335,439.327 m, N(0) = a = 6,378,137 m,
		// M(90) = N(90) = a/√(1−e²) = 6,399,593.626 m.
		expect(meridionalRadius(0)).toBeCloseTo(6335439.327, 2);
		expect(primeVerticalRadius(0)).toBe(6378137);
		expect(meridionalRadius(90)).toBeCloseTo(6399593.626, 2);
		expect(primeVerticalRadius(90)).toBeCloseTo(6399593.626, 2);
	});

	it('edge lengths match GeographicLib geodesic distances to 1e-6', () => {
		// Reference: geographiclib-geodesic Inverse on WGS84
		for (const lat of [-70, 0, 45, 60]) {
			const poly = shapes(lat, 3).pentagon;
			const ring = poly.coordinates[0];
			const segs = plan(poly).segmentLengthsFt;
			for (let i = 0; i < ring.length - 1; i++) {
				const ref = Geodesic.WGS84.Inverse(
					ring[i][1],
					ring[i][0],
					ring[i + 1][1],
					ring[i + 1][0]
				).s12!;
				expect(Math.abs(segs[i] * 0.3048 - ref) / ref).toBeLessThan(1e-6);
			}
		}
	});
});

describe('degenerate and invalid outlines are refused with a reason', () => {
	const p = localPlane(44.9, -93.1);
	const good = p.polygonFt([
		[0, 0],
		[30, 0],
		[30, 20],
		[0, 20]
	]);
	const ring = good.coordinates[0];
	const codeOf = (poly: unknown) => {
		const r = measureFacetPlan(poly as Polygon);
		return r.ok ? 'ok' : r.issues[0].code;
	};

	it('accepts a plain rectangle', () => {
		expect(codeOf(good)).toBe('ok');
	});

	it('refuses a self-intersecting (bow-tie) outline, as turf kinks finds it', () => {
		const bow = { type: 'Polygon', coordinates: [[ring[0], ring[2], ring[1], ring[3], ring[0]]] };
		const r = measureFacetPlan(bow as Polygon);
		expect(r.ok).toBe(false);
		if (r.ok) return;
		expect(r.issues[0].code).toBe('self_intersection');
		expect(r.issues[0].path).toEqual(['geometry']);
		expect(r.issues[0].message).toMatch(/crosses itself/);
	});

	it('refuses an unclosed ring, too few positions and too few distinct corners', () => {
		expect(codeOf({ type: 'Polygon', coordinates: [ring.slice(0, 4)] })).toBe('ring_not_closed');
		expect(codeOf({ type: 'Polygon', coordinates: [[ring[0], ring[1], ring[0]]] })).toBe(
			'too_few_positions'
		);
		expect(
			codeOf({ type: 'Polygon', coordinates: [[ring[0], ring[1], ring[0], ring[1], ring[0]]] })
		).toBe('too_few_vertices');
		expect(codeOf({ type: 'Polygon', coordinates: [[ring[0], ring[1], ring[1], ring[0]]] })).toBe(
			'too_few_vertices'
		);
	});

	it('refuses zero area: collinear corners and a sliver under 1 ft²', () => {
		const line = p.polygonFt([
			[0, 0],
			[10, 0],
			[20, 0]
		]);
		expect(['self_overlap', 'zero_area']).toContain(codeOf(line));
		const sliver = p.polygonFt([
			[0, 0],
			[1, 0],
			[0, 1]
		]);
		expect(codeOf(sliver)).toBe('zero_area');
	});

	it('refuses an outline that doubles back on itself (a spike)', () => {
		const spike = p.polygonFt([
			[0, 0],
			[30, 0],
			[30, 20],
			[15, 20],
			[15, 30],
			[15, 20],
			[0, 20]
		]);
		expect(codeOf(spike)).toBe('self_overlap');
	});

	it('refuses NaN, out-of-range coordinates, holes, and absurd sizes', () => {
		const withPos = (k: number, pos: unknown) => ({
			type: 'Polygon',
			coordinates: [ring.map((q, i) => (i === k ? pos : q))]
		});
		expect(codeOf(withPos(1, [Number.NaN, 44.9]))).toBe('bad_position');
		expect(codeOf(withPos(1, [-93.1, Infinity]))).toBe('bad_position');
		expect(codeOf(withPos(2, [-93.1, 91]))).toBe('out_of_range');
		expect(codeOf(withPos(2, [181, 44.9]))).toBe('out_of_range');
		expect(codeOf({ type: 'Polygon', coordinates: [ring, ring] })).toBe('holes_unsupported');
		expect(codeOf({ type: 'LineString', coordinates: ring })).toBe('not_polygon');
		// a corner mistyped half a degree away makes a tens-of-km edge
		expect(codeOf(withPos(2, [ring[2][0] + 0.5, ring[2][1]]))).toBe('too_large');
	});

	it('tolerates repeated consecutive positions (they add nothing)', () => {
		const dup = {
			type: 'Polygon',
			coordinates: [[ring[0], ring[1], ring[1], ring[2], ring[3], ring[0]]]
		};
		const r = measureFacetPlan(dup as Polygon);
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(r.plan.planAreaFt2).toBeCloseTo(600, 3);
		expect(r.plan.segmentLengthsFt).toHaveLength(5);
		expect(r.plan.segmentLengthsFt[1]).toBe(0);
	});
});

describe('eave length', () => {
	const segs = [40, 15, 40, 15];
	it('sums the segments labelled eave (plan length)', () => {
		expect(eaveLength(segs, ['eave', 'rake', 'eave', 'rake'])).toEqual({
			eaveLengthFt: 80,
			estimated: false
		});
	});
	it('estimates from the longest unlabelled edge when no eave is labelled', () => {
		expect(eaveLength([12, 41, 30], undefined)).toEqual({ eaveLengthFt: 41, estimated: true });
		expect(eaveLength(segs, ['ridge', null, null, 'rake'])).toEqual({
			eaveLengthFt: 40,
			estimated: true
		});
	});
	it('is zero for a fully labelled facet with no eave', () => {
		expect(eaveLength(segs, ['ridge', 'valley', 'hip', 'rake'])).toEqual({
			eaveLengthFt: 0,
			estimated: false
		});
	});
});

describe('convex fast path (turf kinks runs only on non-convex outlines)', () => {
	const star = (points: number, winding: number) =>
		Array.from({ length: points + 1 }, (_, i) => {
			const a = (2 * Math.PI * winding * (i % points)) / points;
			return [Math.cos(a), Math.sin(a)];
		});

	it('knows convex shapes from stars, L-shapes, bow ties and collinear corners', () => {
		expect(isStrictlyConvex(star(4, 1))).toBe(true);
		expect(isStrictlyConvex(star(7, 1).reverse())).toBe(true);
		// a pentagram turns the same way at every corner but winds twice, and crosses itself
		expect(isStrictlyConvex(star(5, 2))).toBe(false);
		expect(kinks({ type: 'Polygon', coordinates: [star(5, 2)] }).features.length).toBeGreaterThan(
			0
		);
		const ell = [
			[0, 0],
			[2, 0],
			[2, 1],
			[1, 1],
			[1, 2],
			[0, 2],
			[0, 0]
		];
		expect(isStrictlyConvex(ell)).toBe(false);
		expect(
			isStrictlyConvex([
				[0, 0],
				[1, 1],
				[1, 0],
				[0, 1],
				[0, 0]
			])
		).toBe(false);
		expect(
			isStrictlyConvex([
				[0, 0],
				[1, 0],
				[2, 0],
				[2, 1],
				[0, 1],
				[0, 0]
			])
		).toBe(false);
	});

	it('never calls a self-crossing ring convex (property, checked against turf kinks)', () => {
		const ring = fc
			.array(fc.tuple(fc.integer({ min: -5, max: 5 }), fc.integer({ min: -5, max: 5 })), {
				minLength: 3,
				maxLength: 8
			})
			.map((pts) => {
				const r = pts.filter((p, i) => i === 0 || p[0] !== pts[i - 1][0] || p[1] !== pts[i - 1][1]);
				return [...r, r[0]];
			});
		let convexSeen = 0;
		fc.assert(
			fc.property(ring, (r) => {
				if (!isStrictlyConvex(r)) return;
				convexSeen++;
				expect(kinks({ type: 'Polygon', coordinates: [r] }).features).toHaveLength(0);
			}),
			{ numRuns: 3000 }
		);
		expect(convexSeen).toBeGreaterThan(10);
	});
});
