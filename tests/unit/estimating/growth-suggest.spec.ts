// Growth suggestion from imagery. Outside references: Web Mercator pixel maths from the OSM
// "Slippy map tilenames" formulas (EPSG:3857); luminance weights of ITU-R BT.709. The scene
// check compares against the sample scene's stored true grades (geodata/scene.geojson), read
// from the very tiles the map shows (geodata/tiles, decoded with sharp). The thresholds and the
// 90% / 60% bar are Clearpitch's own (issue 11), not a published standard.
import { describe, expect, it } from 'vitest';
import { booleanPointInPolygon } from '@turf/turf';
import type { Polygon } from 'geojson';
import { measureSceneFacets } from '../../../geodata/tile-reader';
import { confusionTable } from '../../../geodata/growth-confusion';
import {
	calibrate,
	DEFAULT_GROWTH_THRESHOLDS,
	growthMeasures,
	suggestGrade,
	type FacetRaster
} from '../../../src/lib/estimating/growth-suggest';
import {
	facetTilePixels,
	lngLatToWorldPx,
	TILE_SIZE
} from '../../../src/lib/estimating/tile-pixels';
import { GROWTH_GRADES } from '../../../src/lib/estimating/types';

const idx = (g: string) => GROWTH_GRADES.indexOf(g as never);

/** A square patch of even luminance, with an optional set of dark vertical streaks. */
function patch(
	size: number,
	clean: number,
	streak?: { every: number; width: number; lum: number }
) {
	const lum = new Float32Array(size * size).fill(clean);
	if (streak) {
		for (let y = 0; y < size; y++)
			for (let x = 0; x < size; x++)
				if (x % streak.every < streak.width) lum[y * size + x] = streak.lum;
	}
	const r: FacetRaster = {
		width: size,
		height: size,
		lum,
		inside: new Uint8Array(size * size).fill(1),
		count: size * size
	};
	return r;
}

describe('tile pixels under a facet', () => {
	it('projects like the slippy-map formulas: lon −180 is x 0, the equator is the middle', () => {
		// OSM Slippy map tilenames: x = (lon+180)/360·2^z tiles, y = (1 − ln(tan φ + sec φ)/π)/2·2^z.
		expect(lngLatToWorldPx(-180, 0, 0)).toEqual([0, 128]);
		const [x, y] = lngLatToWorldPx(-74.46, 35.52, 21);
		expect(Math.floor(x / TILE_SIZE)).toBe(Math.floor(((-74.46 + 180) / 360) * 2 ** 21));
		const phi = (35.52 * Math.PI) / 180;
		const ty = ((1 - Math.asinh(Math.tan(phi)) / Math.PI) / 2) * 2 ** 21;
		expect(y / TILE_SIZE).toBeCloseTo(ty, 9);
	});

	it('picks only pixels whose centres lie inside the outline, and leaves the edge band out', () => {
		const poly: Polygon = {
			type: 'Polygon',
			coordinates: [
				[
					[-74.4601, 35.5201],
					[-74.4598, 35.5201],
					[-74.4598, 35.5203],
					[-74.4601, 35.5203],
					[-74.4601, 35.5201]
				]
			]
		};
		const z = 21;
		const r = facetTilePixels(poly, z, { insetPx: 0 });
		const inset = facetTilePixels(poly, z, { insetPx: 3 });
		expect(r.ok && inset.ok).toBe(true);
		if (!r.ok || !inset.ok) return;
		const world = poly.coordinates[0].map(([a, b]) => lngLatToWorldPx(a, b, z));
		const w = Math.abs(world[1][0] - world[0][0]);
		const h = Math.abs(world[2][1] - world[1][1]);
		// An axis-aligned rectangle: the count is its area in pixels, give or take one row and column.
		expect(Math.abs(r.count - w * h)).toBeLessThan(w + h + 2);
		expect(Math.abs(inset.count - (w - 6) * (h - 6))).toBeLessThan(w + h + 2);
		const wp: Polygon = { type: 'Polygon', coordinates: [world] };
		for (const t of r.tiles.slice(0, 2))
			for (const i of t.pixels.slice(0, 50)) {
				const c = [
					t.x * TILE_SIZE + (i % TILE_SIZE) + 0.5,
					t.y * TILE_SIZE + Math.floor(i / TILE_SIZE) + 0.5
				];
				expect(booleanPointInPolygon(c, wp)).toBe(true);
			}
	});
});

describe('growth measures and grades (synthetic patches)', () => {
	it('a clean, even patch is G0 with no streak share', () => {
		const m = growthMeasures(patch(60, 140))!;
		expect(m.streakShare).toBe(0);
		expect(suggestGrade(m).grade).toBe('G0');
	});

	it('a patch under heavy dark streaks is G4', () => {
		const m = growthMeasures(patch(60, 140, { every: 10, width: 6, lum: 30 }))!;
		expect(m.streakShare).toBeGreaterThan(0.5);
		expect(suggestGrade(m).grade).toBe('G4');
	});

	it('more and darker streaks never lower the score', () => {
		const light = growthMeasures(patch(60, 140, { every: 20, width: 4, lum: 110 }))!;
		const heavy = growthMeasures(patch(60, 140, { every: 20, width: 8, lum: 70 }))!;
		expect(heavy.score).toBeGreaterThan(light.score);
	});

	it('refuses to grade a facet with too few pixels', () => {
		expect(growthMeasures(patch(5, 140))).toBeUndefined();
	});

	it('confidence is lowest on a cut and higher inside a band', () => {
		const cuts = DEFAULT_GROWTH_THRESHOLDS.cuts;
		const on = suggestGrade({ score: cuts[2] });
		const inside = suggestGrade({ score: (cuts[1] + cuts[2]) / 2 });
		expect(on.confidence).toBe(0.5);
		expect(inside.confidence).toBeGreaterThan(0.8);
	});

	it('calibrate moves the cuts to where the graded samples change, and reports before/after', () => {
		const samples = [
			{ score: 1, grade: 'G0' },
			{ score: 2, grade: 'G0' },
			{ score: 3, grade: 'G1' },
			{ score: 4, grade: 'G1' },
			{ score: 5, grade: 'G2' },
			{ score: 6, grade: 'G2' },
			{ score: 7, grade: 'G3' },
			{ score: 8, grade: 'G3' },
			{ score: 9, grade: 'G4' },
			{ score: 10, grade: 'G4' }
		] as const;
		const c = calibrate(samples);
		expect(c.thresholds.cuts).toEqual([2.5, 4.5, 6.5, 8.5]);
		expect(c.exactAfter).toBe(10);
		expect(c.errorAfter).toBe(0);
		expect(c.errorBefore).toBeGreaterThan(0);
	});
});

describe('growth suggestion on the sample scene (every facet, from the generated tiles)', () => {
	it('is within one grade on >= 90% of facets and exact on >= 60%', async () => {
		const facets = await measureSceneFacets();
		expect(facets.length).toBe(40);
		const pairs = facets.map((f) => ({
			truth: f.truth,
			suggested: suggestGrade(f.measures).grade
		}));
		console.log(confusionTable(pairs));
		const exact = pairs.filter((p) => p.truth === p.suggested).length;
		const within = pairs.filter((p) => Math.abs(idx(p.truth) - idx(p.suggested)) <= 1).length;
		expect(within / pairs.length).toBeGreaterThanOrEqual(0.9);
		expect(exact / pairs.length).toBeGreaterThanOrEqual(0.6);
	}, 60_000);
});
