import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import {
	booleanPointInPolygon,
	point,
	pointToLineDistance,
	polygonToLine,
	polygon
} from '@turf/turf';
import { afterAll, describe, expect, it } from 'vitest';
import {
	currentStamp,
	encodeTile,
	generateTiles,
	prepareScene,
	renderTile,
	SCENE_FILE,
	stampOf,
	SUN,
	tileJson,
	tileList
} from '../../../geodata/generate-tiles.js';
import { featuresOf, loadScene, sceneBounds, type FacetFeature } from '../../../geodata/scene';

// Tile numbering and pixel positions follow the standard slippy-map formulas (OpenStreetMap
// wiki, "Slippy map tilenames"), written out here rather than taken from the generator.
function tileOf(lon: number, lat: number, z: number) {
	const n = 2 ** z;
	const r = (lat * Math.PI) / 180;
	return {
		x: Math.floor(((lon + 180) / 360) * n),
		y: Math.floor(((1 - Math.log(Math.tan(r) + 1 / Math.cos(r)) / Math.PI) / 2) * n)
	};
}
function pixelCentre(z: number, x: number, y: number, i: number, j: number): [number, number] {
	const n = 2 ** z;
	const lon = ((x + (i + 0.5) / 256) / n) * 360 - 180;
	const lat =
		(Math.atan(Math.sinh(Math.PI * (1 - (2 * (y + (j + 0.5) / 256)) / n))) * 180) / Math.PI;
	return [lon, lat];
}

const facet = (id: string) => featuresOf('facet').find((f) => f.properties.facetId === id)!;
const trees = featuresOf('tree');
const away = (() => {
	const az = (SUN.azimuthDeg * Math.PI) / 180;
	return [-Math.sin(az), -Math.cos(az)];
})();
const M_PER_DEG_LAT = 110_950;

/** Is a point clear of every tree's crown and of the ground its shadow can sweep? */
function clearOfTrees([lon, lat]: [number, number]) {
	const mx = M_PER_DEG_LAT * Math.cos((lat * Math.PI) / 180);
	return trees.every((t) => {
		const [tl, tt] = t.geometry.coordinates;
		const dx = (lon - tl) * mx;
		const dy = (lat - tt) * M_PER_DEG_LAT;
		const { crownRadiusM: r, heightM: h } = t.properties;
		const reach = h / Math.tan((SUN.elevationDeg * Math.PI) / 180) + r;
		const along = Math.max(0, Math.min(reach, dx * away[0] + dy * away[1]));
		const off = Math.hypot(dx - along * away[0], dy - along * away[1]);
		return off > r * 1.25 + 1;
	});
}

const masks = new Map<string, Int32Array>();

/** Pixel offsets of a tile that lie well inside the facet, off its edges and clear of trees. */
function facetMask(f: FacetFeature, z: number, x: number, y: number) {
	const key = `${f.properties.facetId}/${z}/${x}/${y}`;
	const hit = masks.get(key);
	if (hit) return hit;
	const ring = f.geometry.coordinates[0];
	const poly = polygon(f.geometry.coordinates);
	const outline = polygonToLine(poly);
	const lons = ring.map((c) => c[0]);
	const lats = ring.map((c) => c[1]);
	const out: number[] = [];
	for (let j = 0; j < 256; j++)
		for (let i = 0; i < 256; i++) {
			const p = pixelCentre(z, x, y, i, j);
			if (p[0] < Math.min(...lons) || p[0] > Math.max(...lons)) continue;
			if (p[1] < Math.min(...lats) || p[1] > Math.max(...lats)) continue;
			if (!booleanPointInPolygon(point(p), poly)) continue;
			// Keep off the edges, where gutters, caps and rakes are drawn.
			if (pointToLineDistance(point(p), outline as never, { units: 'meters' }) < 0.5) continue;
			if (!clearOfTrees(p)) continue;
			out.push((j * 256 + i) * 4);
		}
	const mask = Int32Array.from(out);
	masks.set(key, mask);
	return mask;
}

/** Mean Rec. 709 luminance of the facet's pixels in the tile over its centroid. */
function facetLuminance(f: FacetFeature, z: number, pixels?: Uint8ClampedArray) {
	const ring = f.geometry.coordinates[0];
	const c = ring.slice(0, -1).reduce((s, p) => [s[0] + p[0], s[1] + p[1]], [0, 0]);
	const n = ring.length - 1;
	const { x, y } = tileOf(c[0] / n, c[1] / n, z);
	const data = pixels ?? renderTile(z, x, y).data;
	const mask = facetMask(f, z, x, y);
	let sum = 0;
	for (const k of mask) sum += 0.2126 * data[k] + 0.7152 * data[k + 1] + 0.0722 * data[k + 2];
	return { mean: sum / mask.length, count: mask.length, tile: { x, y } };
}

// Rendering a tile and masking it costs a second or two on a busy machine.
describe('tile renderer', { timeout: 30_000 }, () => {
	it('draws a G4 facet measurably darker than a G0 facet of the same material and aspect', () => {
		const g4 = facet('h01-f2');
		const g0 = facet('h02-f2');
		expect(g4.properties.growth).toBe('G4');
		expect(g0.properties.growth).toBe('G0');
		expect(g4.properties.material).toBe(g0.properties.material);
		expect(g4.properties.shade).toBe(g0.properties.shade);
		expect(g4.properties.pitch).toBe(g0.properties.pitch);
		expect(
			Math.abs(g4.properties.downslopeAzimuthDeg - g0.properties.downslopeAzimuthDeg)
		).toBeLessThan(5);
		const dark = facetLuminance(g4, 20);
		const clean = facetLuminance(g0, 20);
		expect(dark.count).toBeGreaterThan(500);
		expect(clean.count).toBeGreaterThan(500);
		expect(dark.mean).toBeLessThan(clean.mean * 0.85);
	});

	it('darkens the same facet when only its growth grade goes from G0 to G4', () => {
		const scene = JSON.parse(readFileSync(SCENE_FILE, 'utf8'));
		const withGrade = (g: string) => {
			const copy = structuredClone(scene);
			for (const f of copy.features) if (f.properties.facetId === 'h02-f2') f.properties.growth = g;
			return prepareScene(copy);
		};
		const f = facet('h02-f2');
		const { tile } = facetLuminance(f, 21);
		const g0 = facetLuminance(f, 21, renderTile(21, tile.x, tile.y, withGrade('G0')).data);
		const g2 = facetLuminance(f, 21, renderTile(21, tile.x, tile.y, withGrade('G2')).data);
		const g4 = facetLuminance(f, 21, renderTile(21, tile.x, tile.y, withGrade('G4')).data);
		expect(g0.count).toBeGreaterThan(1000);
		expect(g2.mean).toBeLessThan(g0.mean * 0.97);
		expect(g4.mean).toBeLessThan(g2.mean * 0.9);
	});

	it('shades facets by their aspect: the slope facing the sun is brighter', () => {
		const lit = facetLuminance(facet('h02-f1'), 20);
		const shaded = facetLuminance(facet('h02-f2'), 20);
		expect(facet('h02-f1').properties.downslopeAzimuthDeg).toBe(180);
		expect(lit.mean).toBeGreaterThan(shaded.mean * 1.15);
	});

	it('is deterministic: the same tile twice is byte-identical, whatever was drawn between', () => {
		const { x, y } = tileOf(
			facet('h04-f1').geometry.coordinates[0][0][0],
			facet('h04-f1').geometry.coordinates[0][0][1],
			20
		);
		const a = renderTile(20, x, y);
		renderTile(20, x + 1, y);
		renderTile(17, x >> 3, y >> 3);
		const b = renderTile(20, x, y);
		expect(Buffer.from(a.data).equals(Buffer.from(b.data))).toBe(true);
		const wa = encodeTile(a);
		const wb = encodeTile(b);
		expect(wa.subarray(0, 4).toString('latin1')).toBe('RIFF');
		expect(wa.subarray(8, 12).toString('latin1')).toBe('WEBP');
		expect(wa.equals(wb)).toBe(true);
	});

	it('draws something other than lawn over a house, and fills tiles far from any house', () => {
		const h = featuresOf('house')[0].properties;
		const { x, y } = tileOf(h.lon, h.lat, 21);
		const img = renderTile(21, x, y).data;
		const [w, s] = sceneBounds();
		const edge = tileOf(w, s, 16);
		const empty = renderTile(16, edge.x, edge.y).data;
		let opaque = 0;
		for (let k = 3; k < empty.length; k += 4) if (empty[k] === 255) opaque++;
		expect(opaque).toBe(256 * 256);
		// A roof is not green: somewhere in the tile red and blue come close to green.
		let roofish = 0;
		for (let k = 0; k < img.length; k += 4)
			if (img[k + 1] - Math.max(img[k], img[k + 2]) < 8) roofish++;
		expect(roofish).toBeGreaterThan(2000);
	});
});

describe('tile set', () => {
	it('covers the scene bounds at every zoom from 16 to 21, with no gaps', () => {
		const tiles = tileList();
		const [w, s, e, n] = sceneBounds();
		for (let z = 16; z <= 21; z++) {
			const at = tiles.filter((t) => t.z === z);
			const a = tileOf(w, n, z);
			const b = tileOf(e, s, z);
			for (let x = a.x; x <= b.x; x++)
				for (let y = a.y; y <= b.y; y++) expect(at.some((t) => t.x === x && t.y === y)).toBe(true);
			const xs = new Set(at.map((t) => t.x));
			const ys = new Set(at.map((t) => t.y));
			expect(at.length).toBe(xs.size * ys.size);
		}
		expect(tiles.filter((t) => t.z === 21).length).toBeGreaterThan(100);
	});

	it('describes itself in TileJSON 3.0.0 with the app-relative template', () => {
		const tj = tileJson();
		expect(tj.tilejson).toBe('3.0.0');
		expect(tj.tiles).toEqual(['/tiles/{z}/{x}/{y}.webp']);
		expect([tj.minzoom, tj.maxzoom]).toEqual([16, 21]);
		const [w, s, e, n] = loadScene().bbox;
		expect(tj.bounds[0]).toBeLessThan(w);
		expect(tj.bounds[1]).toBeLessThan(s);
		expect(tj.bounds[2]).toBeGreaterThan(e);
		expect(tj.bounds[3]).toBeGreaterThan(n);
		expect(tj.center[0]).toBeGreaterThan(w);
		expect(tj.center[0]).toBeLessThan(e);
	});

	const dir = mkdtempSync(path.join(tmpdir(), 'clearpitch-tiles-'));
	afterAll(() => rmSync(dir, { recursive: true, force: true }));

	it('skips when the stamp matches the scene and generator, and only then', async () => {
		writeFileSync(path.join(dir, 'tiles.json'), '{}');
		writeFileSync(path.join(dir, '.stamp.json'), JSON.stringify({ ...stampOf(), tiles: 7 }));
		expect(currentStamp(dir)).toMatchObject({ tiles: 7 });
		const logs: string[] = [];
		const r = await generateTiles({ dir, log: (m) => logs.push(m) });
		expect(r).toMatchObject({ skipped: true, tiles: 7 });
		expect(logs.join()).toMatch(/up to date/);
		for (const stale of [{ sceneHash: 'x' }, { generatorHash: 'x' }, { generatorVersion: '0' }]) {
			writeFileSync(
				path.join(dir, '.stamp.json'),
				JSON.stringify({ ...stampOf(), ...stale, tiles: 7 })
			);
			expect(currentStamp(dir)).toBeNull();
		}
		rmSync(path.join(dir, 'tiles.json'));
		writeFileSync(path.join(dir, '.stamp.json'), JSON.stringify({ ...stampOf(), tiles: 7 }));
		expect(currentStamp(dir)).toBeNull();
	});
});
