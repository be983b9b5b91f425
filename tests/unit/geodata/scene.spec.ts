import { readFileSync } from 'node:fs';
import {
	area as turfArea,
	booleanClockwise,
	booleanPointInPolygon,
	booleanValid,
	circle,
	featureCollection,
	intersect,
	kinks,
	lineString,
	point,
	pointToLineDistance,
	polygon
} from '@turf/turf';
import geographiclib from 'geographiclib-geodesic';
import { describe, expect, it } from 'vitest';
import { buildScene, pretty, SCENE_PATH } from '../../../geodata/build-scene';
import {
	featuresOf,
	facetsOf,
	house,
	houses,
	loadScene,
	sceneBounds,
	type FacetFeature,
	type Position
} from '../../../geodata/scene';

// Reference for every area and length below: GeographicLib (C. F. F. Karney, "Algorithms for
// geodesics", J. Geodesy 87:43–55, 2013) through the geographiclib-geodesic package, on WGS84.
const geod = geographiclib.Geodesic.WGS84;
const M2_PER_FT2 = 0.3048 * 0.3048;

function geodesicArea(ring: Position[]): number {
	const p = geod.Polygon(false);
	for (const [lon, lat] of ring.slice(0, -1)) p.AddPoint(lat, lon);
	return p.Compute(false, true).area ?? NaN;
}

/** Ellipsoidal local plane at lat0 (x = N·cosφ0·Δλ, y = M·Δφ), metres. */
function localPlane(lat0: number, lon0: number) {
	const a = 6378137;
	const f = 1 / 298.257223563;
	const e2 = f * (2 - f);
	const s = Math.sin((lat0 * Math.PI) / 180);
	const w = 1 - e2 * s * s;
	const M = (a * (1 - e2)) / (w * Math.sqrt(w));
	const N = a / Math.sqrt(w);
	const rad = Math.PI / 180;
	return ([lon, lat]: Position): Position => [
		N * Math.cos(lat0 * rad) * (lon - lon0) * rad,
		M * (lat - lat0) * rad
	];
}

function shoelace(p: Position[]) {
	let s = 0;
	for (let i = 0; i < p.length - 1; i++) s += p[i][0] * p[i + 1][1] - p[i + 1][0] * p[i][1];
	return s / 2;
}

const scene = loadScene();
const facets = featuresOf('facet');
const byHouse = houses().map(
	(h) => [h.properties.houseId, facetsOf(h.properties.houseId)] as const
);
const EDGE_NAMES = ['eave', 'rake', 'ridge', 'hip', 'valley'];

function toLocal(f: FacetFeature) {
	const h = house(f.properties.houseId)!;
	const to = localPlane(h.properties.lat, h.properties.lon);
	return f.geometry.coordinates[0].map(to);
}

/** Height above ground of a plan point on a facet: eave height plus run from the eave × rise. */
function heightOn(f: FacetFeature, p: Position) {
	const xy = toLocal(f);
	const i = f.properties.edges.indexOf('eave');
	const [a, b] = [xy[i], xy[i + 1]];
	const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
	const out: Position = [(b[1] - a[1]) / len, -(b[0] - a[0]) / len];
	const run = (a[0] - p[0]) * out[0] + (a[1] - p[1]) * out[1];
	return f.properties.eaveHeightM + (run * f.properties.pitch) / 12;
}

describe('scene file', () => {
	it('is what build-scene.ts builds now (regenerate with npx tsx geodata/build-scene.ts)', () => {
		expect(pretty(buildScene()) + '\n').toBe(readFileSync(SCENE_PATH, 'utf8'));
	});

	it('sits in open water around 35.52 N, 74.46 W and its bounds hold every feature', () => {
		const [w, s, e, n] = sceneBounds();
		expect(Math.abs((w + e) / 2 - -74.46)).toBeLessThan(0.01);
		expect(Math.abs((s + n) / 2 - 35.52)).toBeLessThan(0.01);
		for (const f of scene.features) {
			if (f.properties.kind === 'street') continue;
			const g = f.geometry;
			const pts =
				g.type === 'Point'
					? [g.coordinates]
					: g.type === 'LineString'
						? g.coordinates
						: g.coordinates[0];
			for (const [lon, lat] of pts) {
				expect(lon).toBeGreaterThanOrEqual(w);
				expect(lon).toBeLessThanOrEqual(e);
				expect(lat).toBeGreaterThanOrEqual(s);
				expect(lat).toBeLessThanOrEqual(n);
			}
		}
	});

	it('has ten houses, each with its facets, unique ids and an invented Wrenfield address', () => {
		const hs = houses();
		expect(hs).toHaveLength(10);
		expect(new Set(hs.map((h) => h.properties.houseId)).size).toBe(10);
		expect(new Set(facets.map((f) => f.properties.facetId)).size).toBe(facets.length);
		const streets = new Set(featuresOf('street').map((s) => s.properties.name));
		expect(streets.size).toBeGreaterThanOrEqual(2);
		for (const h of hs) {
			const p = h.properties;
			expect(p.address).toMatch(/^\d+ .+, Wrenfield$/);
			expect(streets.has(p.street)).toBe(true);
			expect(facetsOf(p.houseId)).toHaveLength(p.facetCount);
			expect(h.geometry.coordinates).toEqual([p.lon, p.lat]);
			// The house point must lie on its own roof outline's extent.
			const xs = facetsOf(p.houseId).flatMap((f) => f.geometry.coordinates[0].map((c) => c[0]));
			const ys = facetsOf(p.houseId).flatMap((f) => f.geometry.coordinates[0].map((c) => c[1]));
			expect(p.lon).toBeGreaterThan(Math.min(...xs));
			expect(p.lon).toBeLessThan(Math.max(...xs));
			expect(p.lat).toBeGreaterThan(Math.min(...ys));
			expect(p.lat).toBeLessThan(Math.max(...ys));
		}
	});
});

describe('facet polygons', () => {
	it.each(facets.map((f) => [f.properties.facetId, f] as const))(
		'%s is closed, valid, simple, counter-clockwise, one edge label per segment',
		(_, f) => {
			const ring = f.geometry.coordinates[0];
			expect(f.geometry.coordinates).toHaveLength(1);
			expect(ring.length).toBeGreaterThanOrEqual(4);
			expect(ring[ring.length - 1]).toEqual(ring[0]);
			const poly = polygon(f.geometry.coordinates);
			expect(booleanValid(poly)).toBe(true);
			expect(kinks(poly).features).toHaveLength(0);
			expect(booleanClockwise(ring)).toBe(false);
			expect(f.properties.edges).toHaveLength(ring.length - 1);
			for (const e of f.properties.edges) expect(EDGE_NAMES).toContain(e);
			expect(f.properties.edges).toContain('eave');
			expect(['G0', 'G1', 'G2', 'G3', 'G4']).toContain(f.properties.growth);
			expect(['ground', 'ladder', 'roof', 'lift']).toContain(f.properties.access);
			expect(f.properties.stories).toBeGreaterThanOrEqual(1);
			expect(f.properties.stories).toBeLessThanOrEqual(3);
		}
	);

	it.each(facets.map((f) => [f.properties.facetId, f] as const))(
		'%s drains the way its eave edges face, and every eave is level',
		(_, f) => {
			const xy = toLocal(f);
			const edges = f.properties.edges;
			const eaves = edges.flatMap((e, i) => (e === 'eave' ? [i] : []));
			for (const i of eaves) {
				const [a, b] = [xy[i], xy[i + 1]];
				// Outward normal of a counter-clockwise ring is on the right of each edge.
				const az = (Math.atan2(b[1] - a[1], -(b[0] - a[0])) * 180) / Math.PI;
				const diff = Math.abs(((az - f.properties.downslopeAzimuthDeg + 540) % 360) - 180);
				expect(diff).toBeLessThan(0.01);
				expect(heightOn(f, a)).toBeCloseTo(f.properties.eaveHeightM, 3);
				expect(heightOn(f, b)).toBeCloseTo(f.properties.eaveHeightM, 3);
			}
		}
	);
});

describe('facets of one house', () => {
	it.each(byHouse)('%s: plans do not overlap', (_, fs) => {
		expect(fs.length).toBeGreaterThan(0);
		for (let i = 0; i < fs.length; i++)
			for (let j = i + 1; j < fs.length; j++) {
				const x = intersect(
					featureCollection([
						polygon(fs[i].geometry.coordinates),
						polygon(fs[j].geometry.coordinates)
					])
				);
				expect(x ? turfArea(x) : 0).toBeLessThan(0.01);
			}
	});

	it.each(byHouse)('%s: facets meet at shared vertices, never mid-edge', (_, fs) => {
		const local = fs.map(toLocal);
		let checked = 0;
		local.forEach((A, fa) =>
			local.forEach((B, fb) => {
				if (fa === fb) return;
				for (const v of A) {
					for (let i = 0; i < B.length - 1; i++) {
						const [a, b] = [B[i], B[i + 1]];
						const dx = b[0] - a[0];
						const dy = b[1] - a[1];
						const t = ((v[0] - a[0]) * dx + (v[1] - a[1]) * dy) / (dx * dx + dy * dy);
						const d = Math.hypot(a[0] + t * dx - v[0], a[1] + t * dy - v[1]);
						if (t < -1e-9 || t > 1 + 1e-9 || d > 0.01) continue;
						checked++;
						// Within a centimetre of B's edge: it must be one of B's corners, exactly.
						const coordsA = fs[fa].geometry.coordinates[0];
						const coordsB = fs[fb].geometry.coordinates[0];
						const same = coordsB.some(
							(c) => c[0] === coordsA[A.indexOf(v)][0] && c[1] === coordsA[A.indexOf(v)][1]
						);
						expect(same).toBe(true);
					}
				}
			})
		);
		expect(checked).toBeGreaterThan(0);
	});

	it.each(byHouse)(
		'%s: every hip and valley (and all but free ridges) is shared, at one height',
		(_, fs) => {
			const segKey = (a: Position, b: Position) => [a.join(','), b.join(',')].sort().join('|');
			const seen = new Map<string, { f: FacetFeature; i: number }[]>();
			for (const f of fs) {
				const ring = f.geometry.coordinates[0];
				f.properties.edges.forEach((_e, i) => {
					const k = segKey(ring[i], ring[i + 1]);
					seen.set(k, [...(seen.get(k) ?? []), { f, i }]);
				});
			}
			for (const f of fs) {
				const ring = f.geometry.coordinates[0];
				f.properties.edges.forEach((e, i) => {
					if (e !== 'hip' && e !== 'valley' && e !== 'ridge') return;
					const others = seen.get(segKey(ring[i], ring[i + 1]))!.filter((o) => o.f !== f);
					// A porch's high edge runs along a wall, with nothing of the same roof above it.
					if (e === 'ridge' && f.properties.section === 'porch') {
						expect(others.every((o) => o.f.properties.edges[o.i] === 'eave')).toBe(true);
						return;
					}
					expect(others).toHaveLength(1);
					const o = others[0];
					expect(o.f.properties.edges[o.i]).toBe(e);
					const A = toLocal(f);
					for (const p of [A[i], A[i + 1]]) expect(heightOn(o.f, p)).toBeCloseTo(heightOn(f, p), 3);
				});
			}
		}
	);
});

describe('stored truth', () => {
	it.each(facets.map((f) => [f.properties.facetId, f] as const))(
		'%s: plan area is the GeographicLib area; sloped = plan × pitch multiplier',
		(_, f) => {
			const p = f.properties;
			const ring = f.geometry.coordinates[0];
			const ref = geodesicArea(ring);
			expect(ref).toBeGreaterThan(1);
			expect(Math.abs(p.planAreaM2 - ref)).toBeLessThan(1e-5);
			// Stored to 1e-6: compare within that rounding.
			expect(Math.abs(p.planAreaFt2 - ref / M2_PER_FT2)).toBeLessThan(1e-6);
			// The local-plane shoelace agrees with the geodesic area to well under 1 ppm at roof
			// scale; a spherical area (turf) carries a latitude bias of ~0.1 % here, under 0.6 %.
			const [lon0, lat0] = ring
				.slice(0, -1)
				.reduce(
					(s, c) => [s[0] + c[0] / (ring.length - 1), s[1] + c[1] / (ring.length - 1)],
					[0, 0]
				);
			const plane = ring.map(localPlane(lat0, lon0));
			// GeographicLib sums per-edge areas measured from the equator, so its own roundoff is
			// a few 1e-5 m² whatever the size: that floor matters only for the small dormer facets.
			expect(Math.abs(shoelace(plane) - ref)).toBeLessThan(Math.max(1e-6 * ref, 1e-4));
			expect(Math.abs(turfArea(polygon(f.geometry.coordinates)) - ref) / ref).toBeLessThan(0.006);
			// Sloped area of a plane facet is its plan area over cos(slope angle).
			const theta = Math.atan(p.pitch / 12);
			expect(p.slopedAreaFt2).toBeCloseTo(p.planAreaFt2 / Math.cos(theta), 4);
		}
	);

	it('uses the slope multipliers of the published table for the pitches it has', () => {
		// JLC, "Asphalt Shingles Field Guide", slope-factor table (4/12 1.054 … 7/12 1.157), which
		// cuts the factor to three decimals rather than rounding it.
		const table: Record<number, number> = { 4: 1.054, 5: 1.083, 6: 1.118, 7: 1.157 };
		let n = 0;
		for (const f of facets) {
			const want = table[f.properties.pitch];
			if (!want) continue;
			n++;
			const m = f.properties.slopedAreaFt2 / f.properties.planAreaFt2;
			expect(m).toBeGreaterThanOrEqual(want);
			expect(m).toBeLessThan(want + 0.001);
		}
		expect(n).toBeGreaterThan(10);
	});

	it.each(facets.map((f) => [f.properties.facetId, f] as const))(
		'%s: eave length is the GeographicLib length of its eave segments',
		(_, f) => {
			const ring = f.geometry.coordinates[0];
			let m = 0;
			f.properties.edges.forEach((e, i) => {
				if (e === 'eave')
					m += geod.Inverse(ring[i][1], ring[i][0], ring[i + 1][1], ring[i + 1][0]).s12 ?? NaN;
			});
			expect(f.properties.eaveLengthFt * 0.3048).toBeCloseTo(m, 5);
		}
	);

	it.each(houses().map((h) => [h.properties.houseId, h] as const))(
		'%s: totals are the facet sums',
		(_, h) => {
			const fs = facetsOf(h.properties.houseId);
			const sum = (k: 'planAreaFt2' | 'slopedAreaFt2' | 'eaveLengthFt') =>
				fs.reduce((s, f) => s + f.properties[k], 0);
			expect(h.properties.planAreaFt2).toBeCloseTo(sum('planAreaFt2'), 4);
			expect(h.properties.slopedAreaFt2).toBeCloseTo(sum('slopedAreaFt2'), 4);
			expect(h.properties.eaveLengthFt).toBeCloseTo(sum('eaveLengthFt'), 4);
			expect(h.properties.squares).toBeCloseTo(h.properties.slopedAreaFt2 / 100, 5);
			expect(new Set(h.properties.materials)).toEqual(
				new Set(fs.map((f) => f.properties.material))
			);
		}
	);

	it('matches the houses table in geodata/README.md', () => {
		const readme = readFileSync(new URL('../../../geodata/README.md', import.meta.url), 'utf8');
		for (const h of houses()) {
			const row = readme.split('\n').find((l) => l.startsWith(`| ${h.properties.houseId} |`));
			expect(row, h.properties.houseId).toBeDefined();
			const cells = row!.split('|').map((c) => c.trim());
			expect(cells[2]).toBe(h.properties.address);
			expect(Number(cells.at(-2)!.replace(/,/g, ''))).toBeCloseTo(h.properties.slopedAreaFt2, 0);
		}
	});
});

describe('variety the imagery and the tests rely on', () => {
	const all = facets.map((f) => f.properties);

	it('has every material', () => {
		const mats = new Set(all.map((p) => p.material));
		for (const m of [
			'asphalt_shingle',
			'clay_tile',
			'concrete_tile',
			'metal',
			'slate',
			'wood_shake'
		])
			expect(mats.has(m as never)).toBe(true);
	});

	it('has every growth grade and every access grade', () => {
		expect(new Set(all.map((p) => p.growth))).toEqual(new Set(['G0', 'G1', 'G2', 'G3', 'G4']));
		expect(new Set(all.map((p) => p.access))).toEqual(
			new Set(['ground', 'ladder', 'roof', 'lift'])
		);
	});

	it('has a clay tile hip roof with an addition in a different shade, joined by valleys', () => {
		const found = byHouse.find(([, fs]) => {
			const clay = fs.filter((f) => f.properties.material === 'clay_tile');
			const main = clay.filter((f) => f.properties.section === 'main');
			const added = clay.filter((f) => f.properties.section !== 'main');
			return (
				main.some((f) => f.properties.edges.includes('hip')) &&
				added.some((f) => f.properties.edges.includes('valley')) &&
				new Set(main.map((f) => f.properties.shade)).size === 1 &&
				added.every((f) => f.properties.shade !== main[0].properties.shade) &&
				added.length > 0
			);
		});
		expect(found).toBeDefined();
	});

	it('has a 2/12 porch roof, a metal roof, slate, wood shake and concrete tile', () => {
		expect(all.some((p) => p.section === 'porch' && p.pitch === 2)).toBe(true);
		expect(
			all.filter((p) => p.material === 'metal' && p.section === 'main').length
		).toBeGreaterThan(0);
		for (const m of ['slate', 'wood_shake', 'concrete_tile'] as const)
			expect(all.some((p) => p.material === m)).toBe(true);
	});

	it('has an L-shaped cross-gable with valleys and hip roofs with 45° hips', () => {
		const cross = byHouse.find(([, fs]) => fs.some((f) => f.properties.section === 'wing'));
		expect(cross).toBeDefined();
		expect(
			cross![1].filter((f) => f.properties.edges.includes('valley')).length
		).toBeGreaterThanOrEqual(3);
		expect(
			all.filter((p) => p.edges.filter((e) => e === 'hip').length >= 2).length
		).toBeGreaterThan(8);
	});

	it('has dormers cut out of a main slope, joined to it by valleys', () => {
		const dormers = facets.filter((f) => f.properties.section === 'dormer');
		expect(dormers.length).toBeGreaterThanOrEqual(2);
		for (const d of dormers) {
			const main = facetsOf(d.properties.houseId).filter((f) => f.properties.section === 'main');
			const ring = d.geometry.coordinates[0];
			const valley = d.properties.edges.indexOf('valley');
			const [a, b] = [ring[valley], ring[valley + 1]].map((c) => c.join(','));
			const host = main.find((m) => {
				const r = m.geometry.coordinates[0].map((c) => c.join(','));
				return r.includes(a) && r.includes(b);
			});
			expect(host, d.properties.facetId).toBeDefined();
			expect(d.properties.eaveHeightM).toBeGreaterThan(host!.properties.eaveHeightM);
		}
	});

	it('has a ladder-only facet whose eave runs along a fence with shrubs in between', () => {
		const fences = featuresOf('fence');
		const shrubs = featuresOf('shrub');
		const hit = facets.find((f) => {
			if (f.properties.access !== 'ladder') return false;
			const ring = f.geometry.coordinates[0];
			const i = f.properties.edges.indexOf('eave');
			const mid = point([(ring[i][0] + ring[i + 1][0]) / 2, (ring[i][1] + ring[i + 1][1]) / 2]);
			const eave = lineString([ring[i], ring[i + 1]]);
			const nearFence = fences.some(
				(fe) =>
					pointToLineDistance(mid, lineString(fe.geometry.coordinates), { units: 'meters' }) < 2.5
			);
			const nearShrub = shrubs.some(
				(s) => pointToLineDistance(point(s.geometry.coordinates), eave, { units: 'meters' }) < 2
			);
			return nearFence && nearShrub;
		});
		expect(hit).toBeDefined();
	});

	it('has a house with no gutters, and a pool inside a parcel', () => {
		expect(houses().filter((h) => h.properties.noGutters)).toHaveLength(1);
		const pools = featuresOf('pool');
		expect(pools.length).toBeGreaterThan(0);
		const parcel = featuresOf('parcel').find(
			(p) => p.properties.houseId === pools[0].properties.houseId
		)!;
		for (const c of pools[0].geometry.coordinates[0])
			expect(booleanPointInPolygon(point(c), polygon(parcel.geometry.coordinates))).toBe(true);
	});

	it('has trees whose crowns reach over a roof, as recorded', () => {
		const over = featuresOf('tree').filter((t) => t.properties.overhangs);
		expect(over.length).toBeGreaterThanOrEqual(2);
		for (const t of over) {
			const crown = circle(t.geometry.coordinates, t.properties.crownRadiusM, {
				units: 'meters',
				steps: 64
			});
			const covered = facetsOf(t.properties.overhangs!).reduce((s, f) => {
				const x = intersect(featureCollection([crown, polygon(f.geometry.coordinates)]));
				return s + (x ? turfArea(x) : 0);
			}, 0);
			expect(covered, t.properties.treeId).toBeGreaterThan(2);
		}
	});

	it('has driveways and streets with widths', () => {
		expect(featuresOf('driveway').length).toBe(10);
		for (const s of featuresOf('street')) expect(s.properties.widthM).toBeGreaterThan(5);
	});
});
