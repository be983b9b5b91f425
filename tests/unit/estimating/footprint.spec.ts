// Roof facets generated from an outline. Reference values: hand geometry of hip, gable and
// L-shaped roofs (formula beside each check), plane areas from GeographicLib (Karney 2013, the
// reference library for ellipsoidal areas), the slope multiplier √(1+(rise/12)²) = 1/cos θ
// (JLC "Asphalt Shingles Field Guide" table, docs/estimating-model.md §2), and the sample
// scene's stored truth (geodata/scene.geojson, GeographicLib areas of its true facets).
import type { Polygon, Position } from 'geojson';
import { describe, expect, it } from 'vitest';
import { booleanPointInPolygon, pointOnFeature } from '@turf/turf';
import { facetsOf, type FacetFeature } from '../../../geodata/scene';
import {
	facetsFromFootprint,
	type FootprintFacet,
	type FootprintInput
} from '../../../src/lib/estimating/footprint';
import { measureFacetPlan } from '../../../src/lib/estimating/geometry';
import { pitchMultiplier } from '../../../src/lib/estimating/pitch';
import { squareCorners } from '../../../src/lib/estimating/square-corners';
import { geographicLibAreaM2, localPlane, WRENFIELD } from './fixtures';

const plane = localPlane(WRENFIELD.lat, WRENFIELD.lon);
const ringM = (pts: ReadonlyArray<readonly [number, number]>): Position[] =>
	plane.polygonM(pts).coordinates[0];

function roof(input: FootprintInput): FootprintFacet[] {
	const r = facetsFromFootprint(input);
	if (!r.ok) throw new Error(r.message);
	return r.facets;
}

/** Plane areas by GeographicLib, m², keyed by the generated label. */
const areas = (fs: FootprintFacet[]) =>
	Object.fromEntries(fs.map((f) => [f.label, geographicLibAreaM2(f.geometry)]));

/** cos(atan(rise/12)), the cosine of the roof angle: sloped = plan / cos θ. */
const cosPitch = (rise: number) => Math.cos(Math.atan(rise / 12));
const slopedM2 = (f: FootprintFacet) => geographicLibAreaM2(f.geometry) / cosPitch(f.pitch);
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
/**
 * Hand geometry is laid out in a plane about the scene origin and measured by GeographicLib;
 * the module works in a plane about the outline's own centre. The two planes and the ellipsoid
 * agree to a few ppm over a house (docs/estimating-model.md §1), far below a tape's reading.
 */
const EXACT = 1e-5;

describe('a rectangular hip roof, 14 m × 10 m at 6/12', () => {
	// Hand geometry for an equal-pitch hip on w × d (w ≥ d): every hip runs at 45° in plan, so
	// each hip end is a triangle of base d and height d/2 (area d²/4) and each long slope a
	// trapezoid with parallel sides w and w − d, height d/2 (area (2w − d)·d/4).
	const w = 14;
	const d = 10;
	const fs = roof({
		ring: ringM([
			[-7, -5],
			[7, -5],
			[7, 5],
			[-7, 5]
		]),
		form: 'hip',
		pitch: 6
	});
	const a = areas(fs);

	it('gives two trapezoids and two triangles of the hand-computed areas', () => {
		expect(fs).toHaveLength(4);
		expect(rel(a['South slope'], ((2 * w - d) * d) / 4)).toBeLessThan(EXACT);
		expect(rel(a['North slope'], ((2 * w - d) * d) / 4)).toBeLessThan(EXACT);
		expect(rel(a['East slope'], (d * d) / 4)).toBeLessThan(EXACT);
		expect(rel(a['West slope'], (d * d) / 4)).toBeLessThan(EXACT);
		expect(fs.find((f) => f.label === 'East slope')!.geometry.coordinates[0]).toHaveLength(4);
	});

	it('names the edges: eave, hips and the ridge of length w − d', () => {
		const south = fs.find((f) => f.label === 'South slope')!;
		expect(south.edges).toEqual(['eave', 'hip', 'ridge', 'hip']);
		expect(fs.find((f) => f.label === 'East slope')!.edges).toEqual(['eave', 'hip', 'hip']);
		const plan = measureFacetPlan(south.geometry);
		if (!plan.ok) throw new Error('south slope did not measure');
		// Ridge length of a hip roof = w − d (hand geometry), here 4 m.
		expect(plan.plan.segmentLengthsFt[2] * 0.3048).toBeCloseTo(w - d, 6);
	});

	it('slopes every plane at the pitch: sloped = plan / cos(atan(6/12)) = plan × 1.118 (JLC)', () => {
		const total = fs.reduce((s, f) => s + slopedM2(f), 0);
		expect(rel(total, (w * d) / cosPitch(6))).toBeLessThan(EXACT);
		expect(pitchMultiplier(6)).toBeCloseTo(1.118, 3);
		expect(fs.every((f) => f.pitch === 6)).toBe(true);
	});

	it('drains each plane away from the middle (compass bearing of the eave normal)', () => {
		const by = Object.fromEntries(fs.map((f) => [f.label, f.downslopeDeg]));
		expect(by['North slope']).toBeCloseTo(0, 6);
		expect(by['East slope']).toBeCloseTo(90, 6);
		expect(by['South slope']).toBeCloseTo(180, 6);
		expect(by['West slope']).toBeCloseTo(270, 6);
	});

	it('gives the same roof from a clockwise outline', () => {
		const cw = roof({
			ring: ringM([
				[-7, -5],
				[-7, 5],
				[7, 5],
				[7, -5]
			]),
			form: 'hip',
			pitch: 6
		});
		const b = areas(cw);
		for (const k of Object.keys(a)) expect(rel(b[k], a[k])).toBeLessThan(1e-9);
	});

	it('an overhang of o widens the eave line: plan = (w + 2o)(d + 2o)', () => {
		const o = 0.6;
		const wide = roof({
			ring: ringM([
				[-7, -5],
				[7, -5],
				[7, 5],
				[-7, 5]
			]),
			form: 'hip',
			pitch: 6,
			overhangM: o
		});
		const total = wide.reduce((s, f) => s + geographicLibAreaM2(f.geometry), 0);
		expect(rel(total, (w + 2 * o) * (d + 2 * o))).toBeLessThan(EXACT);
	});
});

describe('a gable roof', () => {
	it('gives two rectangles w × d/2 with eave, rakes and the ridge', () => {
		// Hand geometry: a gable on w × d splits along the ridge into two w × d/2 rectangles.
		const fs = roof({
			ring: ringM([
				[-6, -4],
				[6, -4],
				[6, 4],
				[-6, 4]
			]),
			form: 'gable',
			pitch: 8,
			gableEdges: [1, 3]
		});
		expect(fs).toHaveLength(2);
		for (const f of fs) {
			expect(rel(geographicLibAreaM2(f.geometry), 12 * 4)).toBeLessThan(EXACT);
			expect(f.geometry.coordinates[0]).toHaveLength(5);
			expect([...f.edges].sort()).toEqual(['eave', 'rake', 'rake', 'ridge']);
			// sloped = plan / cos(atan(8/12)) = plan × 1.2019 (JLC 1.202)
			expect(slopedM2(f) / geographicLibAreaM2(f.geometry)).toBeCloseTo(1.202, 3);
		}
	});

	it('with a pitch per side puts the ridge where both slopes reach the same height', () => {
		// Level eaves, slopes t1 and t2 over a depth D: the ridge sits where t1·x = t2·(D − x),
		// x = D·t2/(t1 + t2) (hand geometry). 8/12 and 5/12 over 9.1 m: x = 3.5 m.
		const D = 9.1;
		const fs = roof({
			ring: ringM([
				[0, 0],
				[12, 0],
				[12, D],
				[0, D]
			]),
			form: 'gable',
			pitch: [8, 6, 5, 6],
			gableEdges: [1, 3]
		});
		const south = fs.find((f) => f.pitch === 8)!;
		const north = fs.find((f) => f.pitch === 5)!;
		const x = (D * 5) / (8 + 5);
		expect(rel(geographicLibAreaM2(south.geometry), 12 * x)).toBeLessThan(EXACT);
		expect(rel(geographicLibAreaM2(north.geometry), 12 * (D - x))).toBeLessThan(EXACT);
	});

	it('with one gable end and one hip end gives a triangle at the hip only', () => {
		const fs = roof({
			ring: ringM([
				[0, 0],
				[12, 0],
				[12, 8],
				[0, 8]
			]),
			form: 'gable',
			pitch: 6,
			gableEdges: [1]
		});
		expect(fs).toHaveLength(3);
		// The hip end's triangle keeps its d²/4 = 16 m²; the two long slopes share the rest.
		const tri = fs.find((f) => f.geometry.coordinates[0].length === 4)!;
		expect(rel(geographicLibAreaM2(tri.geometry), 16)).toBeLessThan(EXACT);
		const total = fs.reduce((s, f) => s + geographicLibAreaM2(f.geometry), 0);
		expect(rel(total, 96)).toBeLessThan(EXACT);
	});
});

describe('L, T and U outlines', () => {
	it('an L-shaped hip (arms 4 m wide) gives the hand-computed planes and one valley', () => {
		// Arms 4 m wide at one pitch: hips and valleys at 45° in plan, every plane reaching 2 m
		// in from its eave. Hand geometry: end triangles 4·2/2 = 4 m², the inner slopes
		// parallelograms 6·2 = 12 m², the outer slopes trapezoids (10 + 6)/2·2 = 16 m².
		const fs = roof({
			ring: ringM([
				[0, 0],
				[10, 0],
				[10, 4],
				[4, 4],
				[4, 10],
				[0, 10]
			]),
			form: 'hip',
			pitch: 6
		});
		expect(fs).toHaveLength(6);
		const got = fs.map((f) => geographicLibAreaM2(f.geometry)).sort((p, q) => p - q);
		[4, 4, 12, 12, 16, 16].forEach((v, i) => expect(rel(got[i], v)).toBeLessThan(EXACT));
		const valleys = fs.flatMap((f) => f.edges).filter((e) => e === 'valley');
		// One valley line from the inside corner, shared by the two planes beside it.
		expect(valleys).toHaveLength(2);
		expect(fs.flatMap((f) => f.edges).filter((e) => e === 'eave')).toHaveLength(6);
	});

	it('a T and a U fill their outline exactly, every plane a simple polygon', () => {
		const T = ringM([
			[0, 0],
			[4, 0],
			[4, 6],
			[10, 6],
			[10, 10],
			[-6, 10],
			[-6, 6],
			[0, 6]
		]);
		const U = ringM([
			[0, 0],
			[12, 0],
			[12, 10],
			[8, 10],
			[8, 4],
			[4, 4],
			[4, 10],
			[0, 10]
		]);
		for (const [ring, area, gables] of [
			[T, 4 * 6 + 16 * 4, []],
			[U, 12 * 10 - 4 * 6, []],
			[U, 12 * 10 - 4 * 6, [2, 6]]
		] as const) {
			const fs = roof({
				ring,
				form: gables.length ? 'gable' : 'hip',
				pitch: 7,
				gableEdges: gables
			});
			const total = fs.reduce((s, f) => s + geographicLibAreaM2(f.geometry), 0);
			// The planes partition the outline: Σ plan = outline area (shoelace by hand).
			expect(rel(total, area)).toBeLessThan(EXACT);
			for (const f of fs) expect(measureFacetPlan(f.geometry).ok).toBe(true);
		}
	});
});

describe('a flat-and-low roof', () => {
	it('is one plane: the outline plus the overhang, every edge an eave', () => {
		const fs = roof({
			ring: ringM([
				[0, 0],
				[10, 0],
				[10, 6],
				[0, 6]
			]),
			form: 'flat',
			pitch: 0.5,
			overhangM: 0.3
		});
		expect(fs).toHaveLength(1);
		expect(fs[0].edges).toEqual(['eave', 'eave', 'eave', 'eave']);
		expect(rel(geographicLibAreaM2(fs[0].geometry), 10.6 * 6.6)).toBeLessThan(EXACT);
	});
});

describe('bad input is refused with the reason, never thrown', () => {
	const rect = ringM([
		[0, 0],
		[10, 0],
		[10, 6],
		[0, 6]
	]);
	const cases: Array<[string, Partial<FootprintInput> | { ring: Position[] }, string, RegExp]> = [
		['an open ring', { ring: rect.slice(0, -1) }, 'ring', /not closed/],
		[
			'a crossing outline',
			{
				ring: ringM([
					[0, 0],
					[10, 6],
					[10, 0],
					[0, 6]
				])
			},
			'ring',
			/crosses itself/
		],
		['two corners', { ring: [rect[0], rect[1], rect[0]] }, 'ring', /at least 3 corners/],
		['an unknown form', { form: 'dome' as never }, 'form', /hip, gable, flat/],
		['a pitch of 0 on a sloped roof', { pitch: 0 }, 'pitch', /above 0/],
		['a pitch of NaN', { pitch: Number.NaN }, 'pitch', /side 1/],
		['a pitch over 24', { pitch: 30 }, 'pitch', /at most 24/],
		['the wrong number of pitches', { pitch: [6, 6] }, 'pitch', /4 expected, 2 given/],
		[
			'a gable roof with no gable end',
			{ form: 'gable', gableEdges: [] },
			'gableEdges',
			/at least one/
		],
		['a gable end that is no side', { form: 'gable', gableEdges: [4] }, 'gableEdges', /1 to 4/],
		['a gable on a long side', { form: 'gable', gableEdges: [0] }, 'gableEdges', /side 1 cannot/],
		['a negative overhang', { overhangM: -1 }, 'overhangM', /between 0 and 3/],
		['an overhang of Infinity', { overhangM: Infinity }, 'overhangM', /between 0 and 3/]
	];
	for (const [what, patch, field, message] of cases) {
		it(`refuses ${what}`, () => {
			const input = { ring: rect, form: 'hip', pitch: 6, ...patch } as FootprintInput;
			const before = JSON.stringify(input);
			const r = facetsFromFootprint(input);
			expect(r.ok).toBe(false);
			if (r.ok) return;
			expect(r.field).toBe(field);
			expect(r.message).toMatch(message);
			// The input is never changed.
			expect(JSON.stringify(input)).toBe(before);
		});
	}
});

describe('squaring a traced outline', () => {
	it('turns sides within the tolerance onto the building axes and keeps the corner count', () => {
		// A 14 × 10 m rectangle turned 20°, each corner off by up to 0.3 m, as a hand traces it.
		const turn = (20 * Math.PI) / 180;
		const jitter: Array<[number, number]> = [
			[0.2, -0.1],
			[-0.3, 0.2],
			[0.1, 0.3],
			[-0.2, -0.2]
		];
		const pts = (
			[
				[-7, -5],
				[7, -5],
				[7, 5],
				[-7, 5]
			] as const
		).map(([x, y], i): [number, number] => [
			x * Math.cos(turn) - y * Math.sin(turn) + jitter[i][0],
			x * Math.sin(turn) + y * Math.cos(turn) + jitter[i][1]
		]);
		const sq = squareCorners(ringM(pts));
		expect(sq).toHaveLength(5);
		expect(sq[4]).toEqual(sq[0]);
		const xy = sq.slice(0, 4).map((p) => toLocal(p));
		for (let i = 0; i < 4; i++) {
			const a = xy[(i + 3) % 4];
			const b = xy[i];
			const c = xy[(i + 1) % 4];
			const dot = (b[0] - a[0]) * (c[0] - b[0]) + (b[1] - a[1]) * (c[1] - b[1]);
			// Right angle: the dot product of the two sides vanishes (to float precision).
			expect(Math.abs(dot)).toBeLessThan(EXACT);
		}
		// The squared outline keeps the traced area to within the trace's own error (±3%).
		const area = geographicLibAreaM2({ type: 'Polygon', coordinates: [sq] });
		expect(rel(area, 140)).toBeLessThan(0.03);
	});

	it('leaves a 45° side alone', () => {
		const ring = ringM([
			[0, 0],
			[10, 0],
			[10, 6],
			[4, 6],
			[0, 2]
		]);
		const sq = squareCorners(ring);
		for (let i = 0; i < 5; i++) {
			expect(sq[i][0]).toBeCloseTo(ring[i][0], 9);
			expect(sq[i][1]).toBeCloseTo(ring[i][1], 9);
		}
	});
});

const toLocal = (p: Position): [number, number] => {
	const o = plane.toLonLat([0, 0]);
	const e = plane.toLonLat([1, 1]);
	return [(p[0] - o[0]) / (e[0] - o[0]), (p[1] - o[1]) / (e[1] - o[1])];
};

// ---------------------------------------------------------------------------------------------
// Against the scene's truth

interface SceneRoof {
	ring: Position[];
	pitch: number[];
	gableEdges: number[];
}

/**
 * The outline(s) of a scene house: the facet segments no other facet shares (the scene's facets
 * meet at identical vertices, geodata/README.md), chained into rings, each segment with the
 * pitch of its facet and marked a gable end where the scene calls it a rake.
 */
function outlines(facets: FacetFeature[]): SceneRoof[] {
	const key = (p: Position) => `${p[0]},${p[1]}`;
	const segs = facets.flatMap((f) => {
		const r = f.geometry.coordinates[0];
		return r.slice(0, -1).map((p, i) => ({
			a: p,
			b: r[i + 1],
			pitch: f.properties.pitch,
			rake: f.properties.edges[i] === 'rake'
		}));
	});
	const shared = new Set(segs.map((s) => `${key(s.a)}>${key(s.b)}`));
	const outer = segs.filter((s) => !shared.has(`${key(s.b)}>${key(s.a)}`));
	const from = new Map(outer.map((s) => [key(s.a), s]));
	const used = new Set<string>();
	const rings: SceneRoof[] = [];
	for (const start of outer) {
		if (used.has(key(start.a))) continue;
		const ring: Position[] = [];
		const pitch: number[] = [];
		const gableEdges: number[] = [];
		let s = start;
		while (!used.has(key(s.a))) {
			used.add(key(s.a));
			if (s.rake) gableEdges.push(ring.length);
			ring.push(s.a);
			pitch.push(s.pitch);
			s = from.get(key(s.b))!;
		}
		ring.push(ring[0]);
		rings.push({ ring, pitch, gableEdges });
	}
	return rings;
}

describe('the scene houses with pure hip or gable roofs', () => {
	// h01, h02, h05 gables; h08 an asymmetric gable (8/12 front, 5/12 rear); h09 a pyramid hip;
	// h04 a hip with a hip-ended garage (valleys); h10 a hip and a detached gable garage.
	for (const id of ['h01', 'h02', 'h04', 'h05', 'h08', 'h09', 'h10']) {
		it(`${id}: each generated plane within 1% of its true facet, the total within 0.5%`, () => {
			const truth = facetsOf(id);
			const generated = outlines(truth).flatMap((o) =>
				roof({
					ring: o.ring,
					form: o.gableEdges.length ? 'gable' : 'hip',
					pitch: o.pitch,
					gableEdges: o.gableEdges
				})
			);
			expect(generated).toHaveLength(truth.length);
			const matched = new Set<FootprintFacet>();
			let total = 0;
			for (const t of truth) {
				const inside = pointOnFeature(t.geometry as Polygon);
				const g = generated.find((f) => booleanPointInPolygon(inside, f.geometry));
				expect(g, `${t.properties.label}: no generated plane over it`).toBeDefined();
				matched.add(g!);
				const plan = measureFacetPlan(g!.geometry);
				if (!plan.ok) throw new Error(plan.issues[0].message);
				const sloped = plan.plan.planAreaFt2 * pitchMultiplier(g!.pitch);
				expect(g!.pitch).toBe(t.properties.pitch);
				expect(rel(sloped, t.properties.slopedAreaFt2)).toBeLessThan(0.01);
				total += sloped;
			}
			expect(matched.size).toBe(truth.length);
			const trueTotal = truth.reduce((s, t) => s + t.properties.slopedAreaFt2, 0);
			expect(rel(total, trueTotal)).toBeLessThan(0.005);
		});
	}
});
