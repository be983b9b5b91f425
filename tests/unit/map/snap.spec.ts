// Snapping a pointer to neighbouring facets' corners and edges (src/lib/map/snap.ts).
import fc from 'fast-check';
import { nearestPointOnLine, lineString, point, distance } from '@turf/turf';
import { describe, expect, it } from 'vitest';
import { createSnapIndex, snapPoint, type LonLat } from '../../../src/lib/map/snap';
import { facetsOf } from '../../../geodata/scene';
import { mercatorProject } from './reference';

// The invented Wrenfield scene: house h03 (L-shaped cross-gable, four facets sharing ridges
// and valleys), true corners from geodata/scene.geojson.
const h03 = facetsOf('h03');
const origin = h03[0].geometry.coordinates[0][0] as LonLat;
const ZOOM = 21; // MapLibre zoom: about 3 cm per pixel here
const project = mercatorProject(ZOOM, origin);
const index = createSnapIndex(
	h03.map((f) => ({ facetId: f.properties.facetId, ring: f.geometry.coordinates[0] }))
);

describe('snapping to corners', () => {
	it('returns the neighbour corner bit for bit, so shared ridges meet exactly', () => {
		for (const f of h03) {
			for (const c of f.geometry.coordinates[0].slice(0, -1)) {
				const p = project(c as LonLat);
				const hit = snapPoint(index, { x: p.x + 3, y: p.y - 4 }, project, 10);
				expect(hit?.kind).toBe('vertex');
				// the same numbers, not merely close: otherwise two facets leave a sliver
				expect(hit!.lonLat[0]).toBe(c[0]);
				expect(hit!.lonLat[1]).toBe(c[1]);
				expect(hit!.distancePx).toBeCloseTo(5, 9);
			}
		}
	});

	it('prefers a corner within reach over a nearer edge', () => {
		const ring = h03[0].geometry.coordinates[0];
		const a = project(ring[0] as LonLat);
		const b = project(ring[1] as LonLat);
		const len = Math.hypot(b.x - a.x, b.y - a.y);
		const ux = (b.x - a.x) / len;
		const uy = (b.y - a.y) / len;
		// 6 px along the edge from the corner and 1 px off it: the edge is 1 px away, the corner 6
		const cursor = { x: a.x + 6 * ux - uy, y: a.y + 6 * uy + ux };
		const hit = snapPoint(index, cursor, project, 8);
		expect(hit?.kind).toBe('vertex');
		expect(hit!.lonLat).toEqual([ring[0][0], ring[0][1]]);
	});

	it('ignores everything beyond the tolerance', () => {
		const c = project(h03[0].geometry.coordinates[0][0] as LonLat);
		const far = { x: c.x - 400, y: c.y - 400 };
		expect(snapPoint(index, far, project, 10)).toBeNull();
		expect(snapPoint(createSnapIndex([]), { x: 0, y: 0 }, project, 10)).toBeNull();
	});

	it('can leave edges out', () => {
		const ring = h03[0].geometry.coordinates[0];
		const a = project(ring[0] as LonLat);
		const b = project(ring[1] as LonLat);
		const mid = { x: (a.x + b.x) / 2, y: (a.y + b.y) / 2 + 2 };
		expect(snapPoint(index, mid, project, 8)?.kind).toBe('edge');
		expect(snapPoint(index, mid, project, 8, { edges: false })).toBeNull();
	});
});

describe('snapping to edges', () => {
	it('lands on the edge where turf.nearestPointOnLine puts the nearest point (within 5 mm)', () => {
		// Reference: @turf/turf 7.4.0 nearestPointOnLine, computed on the sphere in lon/lat,
		// independent of the screen projection the snapper works in.
		const ring = h03[1].geometry.coordinates[0];
		for (let i = 0; i < ring.length - 1; i++) {
			const a = ring[i] as LonLat;
			const b = ring[i + 1] as LonLat;
			for (const t of [0.3, 0.5, 0.7]) {
				const on: LonLat = [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])];
				const p = project(on);
				const pa = project(a);
				const pb = project(b);
				// 4 px off the edge, perpendicular to it in screen space
				const len = Math.hypot(pb.x - pa.x, pb.y - pa.y);
				const cursor = { x: p.x - (4 * (pb.y - pa.y)) / len, y: p.y + (4 * (pb.x - pa.x)) / len };
				const hit = snapPoint(
					createSnapIndex([{ facetId: 'x', ring: [a, b, [a[0], a[1] + 1e-9]] }]),
					cursor,
					project,
					6
				);
				expect(hit?.kind).toBe('edge');
				const ref = nearestPointOnLine(lineString([a, b]), point(on));
				const offM = distance(point(hit!.lonLat), ref, { units: 'meters' });
				expect(offM).toBeLessThan(0.005);
			}
		}
	});

	it('matches a brute-force search over random pointers and plans (culling never hides a hit)', () => {
		const brute = (cursor: { x: number; y: number }, rings: LonLat[][], tol: number) => {
			let best: { d: number; kind: string } | null = null;
			for (const r of rings)
				for (const c of r) {
					const p = project(c);
					const d = Math.hypot(p.x - cursor.x, p.y - cursor.y);
					if (d <= tol && (!best || best.kind !== 'vertex' || d < best.d))
						best = { d, kind: 'vertex' };
				}
			if (best) return best;
			for (const r of rings)
				for (let i = 0; i < r.length; i++) {
					const p = project(r[i]);
					const q = project(r[(i + 1) % r.length]);
					const ex = q.x - p.x;
					const ey = q.y - p.y;
					const t = Math.max(
						0,
						Math.min(1, ((cursor.x - p.x) * ex + (cursor.y - p.y) * ey) / (ex * ex + ey * ey))
					);
					const d = Math.hypot(p.x + t * ex - cursor.x, p.y + t * ey - cursor.y);
					if (d <= tol && (!best || d < best.d)) best = { d, kind: 'edge' };
				}
			return best;
		};
		const metre = 1 / 111_000;
		let hits = 0;
		const corner = fc.tuple(
			fc.double({ min: -30, max: 30, noNaN: true }),
			fc.double({ min: -30, max: 30, noNaN: true })
		);
		fc.assert(
			fc.property(
				fc.array(fc.array(corner, { minLength: 3, maxLength: 6 }), { minLength: 1, maxLength: 6 }),
				fc.tuple(
					fc.double({ min: -700, max: 700, noNaN: true }),
					fc.double({ min: -700, max: 700, noNaN: true })
				),
				(ringsM, [cx, cy]) => {
					const rings = ringsM.map((r) =>
						r.map(([x, y]) => [origin[0] + x * metre * 1.23, origin[1] + y * metre] as LonLat)
					);
					const idx = createSnapIndex(rings.map((ring, k) => ({ facetId: `f${k}`, ring })));
					const got = snapPoint(idx, { x: cx, y: cy }, project, 12);
					const want = brute({ x: cx, y: cy }, rings, 12);
					if (!want) return got === null;
					hits++;
					return got !== null && got.kind === want.kind && Math.abs(got.distancePx - want.d) < 1e-6;
				}
			),
			{ numRuns: 400 }
		);
		// the property must have met real snaps, not only empty space
		expect(hits).toBeGreaterThan(40);
	});
});
