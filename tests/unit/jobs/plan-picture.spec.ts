// The crew sheet's roof-plan picture. Distances on the picture are checked against
// GeographicLib (geographiclib-geodesic, Karney 2013, J. Geodesy 87:43–55, WGS84 Inverse);
// the picture uses a spherical local plane, so 0.5% is allowed (DOMAIN §4: a sphere is off the
// ellipsoid by under 0.6% at any latitude up to 60°). Ladder spots follow the model's rule of
// one placement per stretch of eave, spread evenly (common practice, no outside source).
import { describe, expect, it } from 'vitest';
import { eaveSegments, planPicture, spreadAlong } from '../../../src/lib/jobs/plan-picture';
import { gableRoof, Geodesic, WRENFIELD } from '../estimating/fixtures';

const roof = gableRoof(WRENFIELD.lat, WRENFIELD.lon).map((f, i) => ({
	id: f.id,
	geometry: f.geometry,
	edges: f.edges,
	access: i === 0 ? 'ladder' : 'ground',
	growth: 'G1',
	ladderPlacements: i === 0 ? 2 : 0
}));

const pts = (s: string) => s.split(' ').map((p) => p.split(',').map(Number) as [number, number]);

describe('planPicture', () => {
	const pic = planPicture(roof);

	it('numbers facets in plan order', () => {
		expect(pic.facets.map((f) => [f.id, f.n])).toEqual([
			['south', 1],
			['north', 2]
		]);
	});

	it('draws edges at their true length in feet (GeographicLib, within 0.5%)', () => {
		for (let k = 0; k < roof.length; k++) {
			const ring = roof[k].geometry.coordinates[0];
			const drawn = pts(pic.facets[k].points);
			for (let i = 0; i < drawn.length; i++) {
				const a = drawn[i];
				const b = drawn[(i + 1) % drawn.length];
				const ref =
					Geodesic.WGS84.Inverse(ring[i][1], ring[i][0], ring[i + 1][1], ring[i + 1][0]).s12! /
					0.3048;
				expect(Math.abs(Math.hypot(b[0] - a[0], b[1] - a[1]) - ref) / ref).toBeLessThan(0.005);
			}
		}
	});

	it('puts north up: the north facet is drawn above the south one', () => {
		const yOf = (n: number) => pic.facets[n].label.y;
		expect(yOf(1)).toBeLessThan(yOf(0));
	});

	it('marks the labelled eaves, and spreads the ladder placements along the ladder facet’s eave', () => {
		expect(pic.facets[0].eaves).toHaveLength(1);
		expect(pic.ladders).toHaveLength(2);
		expect(pic.ladders.every((l) => l.facetId === 'south')).toBe(true);
		// The 40 ft eave: spots at 10 ft and 30 ft along it, both on the eave's line.
		const e = pic.facets[0].eaves[0];
		const along = pic.ladders.map((l) => Math.hypot(l.x - e.x1, l.y - e.y1));
		expect(along[0]).toBeCloseTo(10, 0);
		expect(along[1]).toBeCloseTo(30, 0);
		for (const l of pic.ladders) expect(l.y).toBeCloseTo(e.y1, 1);
	});

	it('keeps every facet inside the view box', () => {
		const [x, y, w, h] = pic.viewBox.split(' ').map(Number);
		for (const f of pic.facets)
			for (const [px, py] of pts(f.points)) {
				expect(px).toBeGreaterThanOrEqual(x);
				expect(py).toBeGreaterThanOrEqual(y);
				expect(px).toBeLessThanOrEqual(x + w);
				expect(py).toBeLessThanOrEqual(y + h);
			}
	});
});

describe('eave segments and spreading', () => {
	const sq = [
		{ x: 0, y: 0 },
		{ x: 30, y: 0 },
		{ x: 30, y: 10 },
		{ x: 0, y: 10 },
		{ x: 0, y: 0 }
	];

	it('takes the labelled eaves, else the longest unlabelled edge (the model’s rule)', () => {
		expect(eaveSegments(sq, ['rake', 'rake', 'eave', 'rake'])).toEqual([[sq[2], sq[3]]]);
		expect(eaveSegments(sq, undefined)).toEqual([[sq[0], sq[1]]]);
		expect(eaveSegments(sq, ['ridge', 'rake', 'ridge', 'rake'])).toEqual([]);
	});

	it('spreads n spots at the middles of n equal shares, across segment ends', () => {
		// Two eaves of 30 ft and 10 ft: 40 ft, four spots at 5, 15, 25, 35 ft.
		const segs: [(typeof sq)[0], (typeof sq)[0]][] = [
			[sq[0], sq[1]],
			[sq[1], sq[2]]
		];
		expect(spreadAlong(segs, 4)).toEqual([
			{ x: 5, y: 0 },
			{ x: 15, y: 0 },
			{ x: 25, y: 0 },
			{ x: 30, y: 5 }
		]);
		expect(spreadAlong([], 3)).toEqual([]);
		expect(spreadAlong(segs, 0)).toEqual([]);
	});
});
