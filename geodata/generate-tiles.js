// @ts-check
/**
 * Draws Clearpitch's synthetic aerial imagery of the Wrenfield sample neighbourhood as XYZ tiles
 * (256 px, Web Mercator, zoom 16–21) into geodata/tiles/{z}/{x}/{y}.webp, plus tiles.json.
 *
 *   node geodata/generate-tiles.js           # skips when the stamp matches scene + generator
 *   node geodata/generate-tiles.js --force   # rebuilds everything
 *
 * Everything is a pure function of world position (noise is hashed from metres or world pixels,
 * per-feature randomness comes from mulberry32 seeded by the feature's id), so every tile is
 * byte-stable and neighbouring tiles meet without seams, whatever order or thread draws them.
 * Pixels are shaded in JavaScript and only encoded by @napi-rs/canvas: the look needs per-pixel
 * lighting, and a software rasteriser with exact horizontal coverage gives clean shared edges.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker, isMainThread, parentPort, workerData } from 'node:worker_threads';
import { createCanvas, ImageData } from '@napi-rs/canvas';
import { mulberry32 } from './prng.js';

/** Bump when the look changes on purpose; the stamp also records this file's own hash. */
export const GENERATOR_VERSION = '1.0.0';
export const TILE_SIZE = 256;
export const MIN_ZOOM = 16;
export const MAX_ZOOM = 21;
/** Ground drawn around the scene's bounds so the map never shows an edge near a house. */
export const MARGIN_M = 25;
export const WEBP_QUALITY = 80;

const HERE = path.dirname(fileURLToPath(import.meta.url));
export const SCENE_FILE = path.join(HERE, 'scene.geojson');
export const TILES_DIR = path.join(HERE, 'tiles');

/** Afternoon sun from the south-west, 45° up: south- and west-facing slopes are the lit ones. */
export const SUN = { azimuthDeg: 225, elevationDeg: 45 };
const SUN_L = (() => {
	const az = (SUN.azimuthDeg * Math.PI) / 180;
	const el = (SUN.elevationDeg * Math.PI) / 180;
	return [Math.cos(el) * Math.sin(az), Math.cos(el) * Math.cos(az), Math.sin(el)];
})();
/** Ground offset of a shadow per metre of height: away from the sun, 1/tan(elevation) long. */
const SHADOW_DIR = (() => {
	const k = 1 / Math.tan((SUN.elevationDeg * Math.PI) / 180);
	const h = Math.hypot(SUN_L[0], SUN_L[1]);
	return [(-SUN_L[0] / h) * k, (-SUN_L[1] / h) * k];
})();
const FLAT_LIGHT = light(SUN_L[2]);
const SHADOW_TINT = [0.5, 0.54, 0.64];
const HAZE = [0.66, 0.7, 0.74];

/** @param {number} nDotL */
function light(nDotL) {
	return 0.42 + 0.62 * Math.max(0, nDotL);
}

// ---------------------------------------------------------------------------------------------
// Randomness: mulberry32 for per-feature constants, integer hashing for position noise

/** FNV-1a, to seed a feature's PRNG from its id. @param {string} s */
function seedOf(s) {
	let h = 0x811c9dc5;
	for (let i = 0; i < s.length; i++) h = Math.imul(h ^ s.charCodeAt(i), 0x01000193);
	return h >>> 0;
}

/** @param {number} ix @param {number} iy @param {number} seed */
function hash2(ix, iy, seed) {
	let h = (Math.imul(ix, 374761393) + Math.imul(iy, 668265263) + Math.imul(seed, 982451653)) | 0;
	h = Math.imul(h ^ (h >>> 13), 1274126177);
	h ^= h >>> 16;
	return (h >>> 0) / 4294967296;
}

/**
 * Gradient noise, tileable, built once: 1024² samples, 8 per lattice cell (a period of 128
 * cells), equalised so a value is also the share of area below it. A table lookup is ~20×
 * cheaper than hashing four lattice points per call, which decides whether the whole
 * neighbourhood renders in seconds or minutes.
 */
const NT = 1024;
const NCELL = 8;
/**
 * @param {number} seed
 * @param {number[]} octaves lattice cell sizes in samples (each a divisor of NT) with weights
 *   following as pairs: [cell, weight, cell, weight, …]
 */
function noiseTable(seed, octaves) {
	const rnd = mulberry32(seed);
	const t = new Float32Array(NT * NT);
	const fade = (/** @type {number} */ v) => v * v * v * (v * (v * 6 - 15) + 10);
	for (let o = 0; o < octaves.length; o += 2) {
		const size = octaves[o];
		const weight = octaves[o + 1];
		const cells = NT / size;
		const gx = new Float32Array(cells * cells);
		const gy = new Float32Array(cells * cells);
		for (let k = 0; k < cells * cells; k++) {
			const a = rnd() * 2 * Math.PI;
			gx[k] = Math.cos(a);
			gy[k] = Math.sin(a);
		}
		for (let j = 0; j < NT; j++) {
			const y = j / size;
			const iy = Math.floor(y);
			const fy = y - iy;
			const y0 = (iy % cells) * cells;
			const y1 = ((iy + 1) % cells) * cells;
			const sy = fade(fy);
			for (let i = 0; i < NT; i++) {
				const x = i / size;
				const ix = Math.floor(x);
				const fx = x - ix;
				const x0 = ix % cells;
				const x1 = (ix + 1) % cells;
				const sx = fade(fx);
				const d00 = gx[y0 + x0] * fx + gy[y0 + x0] * fy;
				const d10 = gx[y0 + x1] * (fx - 1) + gy[y0 + x1] * fy;
				const d01 = gx[y1 + x0] * fx + gy[y1 + x0] * (fy - 1);
				const d11 = gx[y1 + x1] * (fx - 1) + gy[y1 + x1] * (fy - 1);
				const a = d00 + (d10 - d00) * sx;
				const b = d01 + (d11 - d01) * sx;
				t[j * NT + i] += (a + (b - a) * sy) * weight;
			}
		}
	}
	const BINS = 4096;
	const hist = new Float64Array(BINS + 1);
	const lo = -1;
	const hi = 1;
	const bin = (/** @type {number} */ v) =>
		Math.min(BINS - 1, Math.max(0, Math.floor(((v - lo) / (hi - lo)) * BINS)));
	for (let k = 0; k < t.length; k++) hist[bin(t[k]) + 1]++;
	for (let k = 1; k <= BINS; k++) hist[k] += hist[k - 1];
	for (let k = 0; k < t.length; k++) {
		const v = t[k];
		const b = bin(v);
		const f = ((v - lo) / (hi - lo)) * BINS - b;
		t[k] = (hist[b] + (hist[b + 1] - hist[b]) * Math.min(1, Math.max(0, f))) / t.length;
	}
	return t;
}
const NOISE = noiseTable(0x5eed1e55, [NCELL, 1]);
/** Two octaves (a cell and its quarter) in one lookup, for ground texture. */
const NOISE2 = noiseTable(0x2b0c7a11, [NCELL, 0.75, NCELL / 4, 0.3]);

/**
 * Smooth noise in [0, 1] at cell units (one cell ≈ one blob); `seed` picks an unrelated region
 * of the table. @param {number} x @param {number} y @param {number} seed
 */
function vnoise(x, y, seed) {
	const u = (x + ((Math.imul(seed, 0x9e3779b1) >>> 0) & 0xffff) / 512) * NCELL;
	const v = (y + ((Math.imul(seed, 0x85ebca77) >>> 0) & 0xffff) / 512) * NCELL;
	const iu = Math.floor(u);
	const iv = Math.floor(v);
	const fu = u - iu;
	const fv = v - iv;
	const x0 = iu & (NT - 1);
	const x1 = (iu + 1) & (NT - 1);
	const r0 = (iv & (NT - 1)) * NT;
	const r1 = ((iv + 1) & (NT - 1)) * NT;
	const a = NOISE[r0 + x0];
	const b = NOISE[r0 + x1];
	const c = NOISE[r1 + x0];
	const d = NOISE[r1 + x1];
	return a + (b - a) * fu + (c - a) * fv + (a - b - c + d) * fu * fv;
}

/**
 * Noise at cell size `cell` metres, faded to its mean once a cell is under ~1.5 px so distant
 * zooms get an even tone instead of shimmer. @param {number} X @param {number} Y
 * @param {number} cell @param {number} seed @param {number} mpp
 */
function lodNoise(X, Y, cell, seed, mpp) {
	const k = lod(cell, mpp);
	if (k === 0) return 0.5;
	return 0.5 + (vnoise(X / cell, Y / cell, seed) - 0.5) * k;
}

/**
 * @typedef {{ t: Float32Array, k: number, x0: Int32Array, x1: Int32Array, fu: Float32Array, r0: Int32Array,
 *   r1: Int32Array, fv: Float32Array }} GridNoise
 */

/**
 * vnoise() at every pixel centre of a tile, set up once per tile: a pixel's x depends on its
 * column only and its y on its row only, so a lookup is four reads and a blend. `k` is the
 * zoom fade of lodNoise(). @param {Float64Array} X @param {Float64Array} Y @param {number} cell
 * @param {number} seed @param {number} mpp @param {Float32Array} [table] @returns {GridNoise}
 */
function gridNoise(X, Y, cell, seed, mpp, table = NOISE) {
	const n = X.length;
	const g = {
		t: table,
		k: lod(cell, mpp),
		x0: new Int32Array(n),
		x1: new Int32Array(n),
		fu: new Float32Array(n),
		r0: new Int32Array(n),
		r1: new Int32Array(n),
		fv: new Float32Array(n)
	};
	const ox = ((Math.imul(seed, 0x9e3779b1) >>> 0) & 0xffff) / 512;
	const oy = ((Math.imul(seed, 0x85ebca77) >>> 0) & 0xffff) / 512;
	for (let i = 0; i < n; i++) {
		const u = (X[i] / cell + ox) * NCELL;
		const iu = Math.floor(u);
		g.x0[i] = iu & (NT - 1);
		g.x1[i] = (iu + 1) & (NT - 1);
		g.fu[i] = u - iu;
		const v = (Y[i] / cell + oy) * NCELL;
		const iv = Math.floor(v);
		g.r0[i] = (iv & (NT - 1)) * NT;
		g.r1[i] = ((iv + 1) & (NT - 1)) * NT;
		g.fv[i] = v - iv;
	}
	return g;
}

/** @param {GridNoise} g @param {number} i @param {number} j */
function gn(g, i, j) {
	const fu = g.fu[i];
	const fv = g.fv[j];
	const t = g.t;
	const a = t[g.r0[j] + g.x0[i]];
	const b = t[g.r0[j] + g.x1[i]];
	const c = t[g.r1[j] + g.x0[i]];
	const d = t[g.r1[j] + g.x1[i]];
	return a + (b - a) * fu + (c - a) * fv + (a - b - c + d) * fu * fv;
}

/** gn() faded to 0.5 with zoom, as lodNoise(). @param {GridNoise} g @param {number} i @param {number} j */
function gl(g, i, j) {
	return g.k === 0 ? 0.5 : 0.5 + (gn(g, i, j) - 0.5) * g.k;
}

/** 0 when a pattern of this period is below ~1.5 px, 1 from 4 px up. @param {number} period @param {number} mpp */
function lod(period, mpp) {
	const px = period / mpp;
	return px <= 1.5 ? 0 : px >= 4 ? 1 : (px - 1.5) / 2.5;
}

/** @param {number} e0 @param {number} e1 @param {number} x */
function smoothstep(e0, e1, x) {
	const t = Math.min(1, Math.max(0, (x - e0) / (e1 - e0)));
	return t * t * (3 - 2 * t);
}

/**
 * Share of a pixel (centre at distance d, half-size h) covered by the band [lo, hi] of distance:
 * thin lines fade with zoom instead of vanishing or aliasing.
 * @param {number} d @param {number} lo @param {number} hi @param {number} h
 */
function band(d, lo, hi, h) {
	const o = Math.min(d + h, hi) - Math.max(d - h, lo);
	return o <= 0 ? 0 : o / (2 * h);
}

/** @param {string} hex @returns {[number, number, number]} */
function rgb(hex) {
	const n = parseInt(hex.replace('#', ''), 16);
	return [((n >> 16) & 255) / 255, ((n >> 8) & 255) / 255, (n & 255) / 255];
}

// ---------------------------------------------------------------------------------------------
// Scene preparation: metres for shading, Web Mercator for rasterising

/**
 * @typedef {[number, number]} P2
 * @typedef {{ type: string, coordinates: any }} Geometry
 * @typedef {{ type: 'Feature', properties: Record<string, any>, geometry: Geometry }} Feature
 * @typedef {{ type: 'FeatureCollection', origin: P2, bbox: number[], features: Feature[] }} SceneFC
 * @typedef {{ ax: number, ay: number, dx: number, dy: number, il: number }} Seg
 * @typedef {{ minX: number, minY: number, maxX: number, maxY: number }} Box
 */

/** @param {number} lon @param {number} lat @returns {P2} */
function merc(lon, lat) {
	const s = Math.sin((lat * Math.PI) / 180);
	return [(lon + 180) / 360, 0.5 - Math.log((1 + s) / (1 - s)) / (4 * Math.PI)];
}

/** @param {number} lat0 */
function metresPerDegree(lat0) {
	const a = 6378137;
	const f = 1 / 298.257223563;
	const e2 = f * (2 - f);
	const s = Math.sin((lat0 * Math.PI) / 180);
	const w = 1 - e2 * s * s;
	const M = (a * (1 - e2)) / (w * Math.sqrt(w));
	const N = a / Math.sqrt(w);
	return { kx: (N * Math.cos((lat0 * Math.PI) / 180) * Math.PI) / 180, ky: (M * Math.PI) / 180 };
}

/** @param {P2} a @param {P2} b @returns {Seg} */
function seg(a, b) {
	const dx = b[0] - a[0];
	const dy = b[1] - a[1];
	return { ax: a[0], ay: a[1], dx, dy, il: 1 / (dx * dx + dy * dy || 1) };
}

/** Distance from (x, y) to a segment, with the position along it (0..1). @param {Seg} s @param {number} x @param {number} y */
function segDist(s, x, y) {
	let t = ((x - s.ax) * s.dx + (y - s.ay) * s.dy) * s.il;
	t = t < 0 ? 0 : t > 1 ? 1 : t;
	return Math.sqrt((s.ax + t * s.dx - x) ** 2 + (s.ay + t * s.dy - y) ** 2);
}

/** @param {P2[]} pts @param {number} [pad] @returns {Box} */
function boxOf(pts, pad = 0) {
	let minX = Infinity;
	let minY = Infinity;
	let maxX = -Infinity;
	let maxY = -Infinity;
	for (const [x, y] of pts) {
		if (x < minX) minX = x;
		if (y < minY) minY = y;
		if (x > maxX) maxX = x;
		if (y > maxY) maxY = y;
	}
	return { minX: minX - pad, minY: minY - pad, maxX: maxX + pad, maxY: maxY + pad };
}

/** @param {Box} a @param {Box} b */
function overlaps(a, b) {
	return a.minX <= b.maxX && a.maxX >= b.minX && a.minY <= b.maxY && a.maxY >= b.minY;
}

/** @param {P2[]} r */
function signedArea(r) {
	let s = 0;
	for (let i = 0; i < r.length; i++) {
		const a = r[i];
		const b = r[(i + 1) % r.length];
		s += a[0] * b[1] - b[0] * a[1];
	}
	return s / 2;
}

/** @param {P2[]} ring @param {number} x @param {number} y */
function inside(ring, x, y) {
	let c = false;
	for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
		const [xi, yi] = ring[i];
		const [xj, yj] = ring[j];
		if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) c = !c;
	}
	return c;
}

const MATERIALS = ['asphalt_shingle', 'clay_tile', 'concrete_tile', 'metal', 'slate', 'wood_shake'];
const LAWNS = /** @type {Record<string, [number, number, number]>} */ ({
	lush: [0.3, 0.37, 0.19],
	fresh: [0.35, 0.4, 0.22],
	dry: [0.41, 0.42, 0.26]
});

/**
 * Turns the GeoJSON scene into what the renderer needs: rings in metres (east/north of the
 * scene origin) and in Web Mercator units, facet planes, and the shadow outlines of each house.
 * @param {SceneFC} scene
 */
export function prepareScene(scene) {
	const [lon0, lat0] = scene.origin;
	const { kx, ky } = metresPerDegree(lat0);
	/** @param {number[]} c @returns {P2} */
	const toM = (c) => [(c[0] - lon0) * kx, (c[1] - lat0) * ky];
	/** @param {P2} p @returns {P2} */
	const mToMerc = (p) => merc(lon0 + p[0] / kx, lat0 + p[1] / ky);
	/** @param {number[][]} ring closed GeoJSON ring @returns {P2[]} */
	const openM = (ring) => ring.slice(0, -1).map(toM);
	const of = (/** @type {string} */ kind) =>
		scene.features.filter((f) => f.properties.kind === kind);

	const houseProps = new Map(of('house').map((h) => [h.properties.houseId, h.properties]));

	const facets = of('facet').map((f) => {
		const p = f.properties;
		const ring = openM(f.geometry.coordinates[0]);
		/** @type {string[]} */
		const edges = p.edges;
		let nx = 0;
		let ny = 0;
		/** @type {P2} */
		let e0 = [0, 0];
		edges.forEach((e, i) => {
			if (e !== 'eave') return;
			const a = ring[i];
			const b = ring[(i + 1) % ring.length];
			nx += b[1] - a[1];
			ny += -(b[0] - a[0]);
			e0 = a;
		});
		const l = Math.hypot(nx, ny);
		const down = [nx / l, ny / l];
		const rise = p.pitch / 12;
		const theta = Math.atan(rise);
		const normal = [Math.sin(theta) * down[0], Math.sin(theta) * down[1], Math.cos(theta)];
		const nDotL = normal[0] * SUN_L[0] + normal[1] * SUN_L[1] + normal[2] * SUN_L[2];
		const runs = ring.map(([x, y]) => (e0[0] - x) * down[0] + (e0[1] - y) * down[1]);
		/** @type {Record<string, Seg[]>} */
		const byType = { eave: [], rake: [], ridge: [], hip: [], valley: [] };
		edges.forEach((e, i) => byType[e].push(seg(ring[i], ring[(i + 1) % ring.length])));
		const g = Number(String(p.growth).slice(1));
		const house = houseProps.get(p.houseId) ?? {};
		return {
			id: /** @type {string} */ (p.facetId),
			houseId: /** @type {string} */ (p.houseId),
			section: /** @type {string} */ (p.section),
			ll: /** @type {number[][]} */ (f.geometry.coordinates[0]),
			ring,
			merc: f.geometry.coordinates[0]
				.slice(0, -1)
				.map((/** @type {number[]} */ c) => merc(c[0], c[1])),
			box: boxOf(ring),
			edges,
			material: Math.max(0, MATERIALS.indexOf(p.material)),
			growth: g,
			shade: rgb(p.shade ?? '#777777'),
			eaveH: /** @type {number} */ (p.eaveHeightM ?? 3),
			e0,
			down,
			along: [-down[1], down[0]],
			mult: Math.sqrt(1 + rise * rise),
			rise,
			normal,
			nDotL,
			bright: light(nDotL) / FLAT_LIGHT,
			runMax: Math.max(...runs),
			heights: runs.map((r) => (p.eaveHeightM ?? 3) + r * rise),
			caps: [...byType.ridge, ...byType.hip],
			valleys: byType.valley,
			eaves: byType.eave,
			rakes: byType.rake,
			gutters: !house.noGutters && p.section !== 'dormer',
			seed: seedOf(p.facetId)
		};
	});

	const houses = [...houseProps.keys()].map((houseId) => {
		const fs = facets.filter((f) => f.houseId === houseId);
		// A segment used by one facet only is on the outline: a wall stands under it, and the
		// wall's shadow joins the roof's. Shared segments are inside the roof.
		const count = new Map();
		const segKey = (/** @type {number[]} */ a, /** @type {number[]} */ b) =>
			[a.join(','), b.join(',')].sort().join('|');
		for (const f of fs)
			for (let i = 0; i < f.ll.length - 1; i++) {
				const k = segKey(f.ll[i], f.ll[i + 1]);
				count.set(k, (count.get(k) ?? 0) + 1);
			}
		/** @type {P2[][]} */
		const shadows = [];
		const [sx, sy] = SHADOW_DIR;
		for (const f of fs) {
			const n = f.ring.length;
			/** @type {P2[]} */
			const roof = f.ring.map(([x, y], i) => [x + f.heights[i] * sx, y + f.heights[i] * sy]);
			shadows.push(roof);
			for (let i = 0; i < n; i++) {
				if (count.get(segKey(f.ll[i], f.ll[i + 1])) !== 1) continue;
				const j = (i + 1) % n;
				shadows.push([f.ring[i], f.ring[j], roof[j], roof[i]]);
			}
		}
		// Every piece the same way round, so a non-zero fill gives their exact union.
		const oriented = shadows
			.filter((r) => Math.abs(signedArea(r)) > 1e-6)
			.map((r) => (signedArea(r) < 0 ? [...r].reverse() : r));
		return {
			id: houseId,
			facets: fs,
			box: boxOf(fs.flatMap((f) => f.ring)),
			shadow: oriented.map((r) => r.map(mToMerc)),
			shadowBox: boxOf(oriented.flat())
		};
	});

	const streets = of('street').map((f) => {
		const pts = f.geometry.coordinates.map(toM);
		const p = f.properties;
		const hw = p.widthM / 2;
		const reach = hw + (p.vergeM ?? 0) + (p.sidewalkM ?? 0);
		/** @type {(Seg & { s0: number, len: number, box: Box })[]} */
		const segs = [];
		let s0 = 0;
		for (let i = 0; i < pts.length - 1; i++) {
			const s = seg(pts[i], pts[i + 1]);
			const len = Math.hypot(s.dx, s.dy);
			segs.push({ ...s, s0, len, box: boxOf([pts[i], pts[i + 1]], reach + 0.5) });
			s0 += len;
		}
		return {
			hw,
			verge: p.vergeM ?? 0,
			walk: p.sidewalkM ?? 0,
			reach,
			segs,
			box: boxOf(pts, reach + 0.5)
		};
	});

	const area = (/** @type {Feature} */ f, /** @type {number} */ k) => {
		const ring = openM(f.geometry.coordinates[0]);
		const rnd = mulberry32(seedOf(String(f.properties.houseId ?? f.properties.name ?? k)));
		return {
			ring,
			merc: f.geometry.coordinates[0]
				.slice(0, -1)
				.map((/** @type {number[]} */ c) => merc(c[0], c[1])),
			box: boxOf(ring),
			props: f.properties,
			rnd: (() => {
				const a = rnd() * Math.PI;
				return [a, Math.cos(a), Math.sin(a), rnd()];
			})(),
			seed: seedOf(String(f.properties.houseId ?? f.properties.name ?? k) + f.properties.kind)
		};
	};
	const lawns = [...of('parcel'), ...of('lawn')].map(area);
	const driveways = of('driveway').map((f, k) => {
		const a = area(f, k);
		// The long side sets the direction of joints and tyre marks.
		let best = 0;
		let dir = [1, 0];
		for (let i = 0; i < a.ring.length; i++) {
			const p = a.ring[i];
			const q = a.ring[(i + 1) % a.ring.length];
			const l = Math.hypot(q[0] - p[0], q[1] - p[1]);
			if (l > best) {
				best = l;
				dir = [(q[0] - p[0]) / l, (q[1] - p[1]) / l];
			}
		}
		const cx = a.ring.reduce((s, p) => s + p[0], 0) / a.ring.length;
		const cy = a.ring.reduce((s, p) => s + p[1], 0) / a.ring.length;
		return { ...a, dir, cx, cy };
	});
	const pools = of('pool').map((f, k) => {
		const a = area(f, k);
		const deck = f.properties.deckM ?? 1.2;
		const n = a.ring.length;
		return {
			...a,
			deck,
			segs: a.ring.map((p, i) => seg(p, a.ring[(i + 1) % n])),
			outer: boxOf(a.ring, deck + 0.5)
		};
	});
	const fences = of('fence').map((f) => {
		const pts = f.geometry.coordinates.map(toM);
		const h = f.properties.heightM ?? 1.8;
		/** @type {Seg[]} */
		const segs = [];
		/** @type {P2[][]} */
		const shadow = [];
		for (let i = 0; i < pts.length - 1; i++) {
			segs.push(seg(pts[i], pts[i + 1]));
			/** @type {P2[]} */
			const q = [
				pts[i],
				pts[i + 1],
				[pts[i + 1][0] + h * SHADOW_DIR[0], pts[i + 1][1] + h * SHADOW_DIR[1]],
				[pts[i][0] + h * SHADOW_DIR[0], pts[i][1] + h * SHADOW_DIR[1]]
			];
			shadow.push(signedArea(q) < 0 ? q.reverse() : q);
		}
		return {
			segs,
			vinyl: f.properties.style === 'vinyl',
			shadow: shadow.map((r) => r.map(mToMerc)),
			box: boxOf(pts, h * 1.5 + 0.5)
		};
	});
	const blobs = (/** @type {string} */ kind) =>
		of(kind).map((f) => {
			const [X, Y] = toM(f.geometry.coordinates);
			const p = f.properties;
			const r = p.crownRadiusM ?? p.radiusM;
			const h = p.heightM ?? r * 1.6;
			const seed = seedOf(p.treeId ?? p.shrubId);
			const rnd = mulberry32(seed);
			const crownMid = Math.max(h - r * 0.9, r * 0.6);
			return {
				X,
				Y,
				r,
				h,
				conifer: p.form === 'conifer',
				seed,
				tint: [rnd() - 0.5, rnd() - 0.5],
				sx: X + crownMid * SHADOW_DIR[0],
				sy: Y + crownMid * SHADOW_DIR[1],
				box: boxOf(
					[
						[X, Y],
						[X + h * SHADOW_DIR[0], Y + h * SHADOW_DIR[1]]
					],
					r * 1.6 + 0.5
				)
			};
		});

	const [w, s, e, n] = scene.bbox;
	const dLon = MARGIN_M / kx;
	const dLat = MARGIN_M / ky;
	return {
		origin: [lon0, lat0],
		kx,
		ky,
		bounds: [w - dLon, s - dLat, e + dLon, n + dLat],
		facets,
		houses,
		streets,
		lawns,
		driveways,
		pools,
		fences,
		trees: blobs('tree').sort((a, b) => a.h - b.h),
		shrubs: blobs('shrub')
	};
}

/** @typedef {ReturnType<typeof prepareScene>} Prepared */

// ---------------------------------------------------------------------------------------------
// Rasteriser: four sub-scanlines per pixel row, exact coverage along each

const N = TILE_SIZE;

/**
 * Adds each pixel's covered share of the non-zero union of `rings` (tile pixel coordinates) to
 * `cov`. Two polygons that share an edge add up to exactly 1 along it, so facets drawn side by
 * side leave no seam. Returns the touched pixel rectangle, or null.
 * @param {Float64Array[]} rings flat [x0, y0, x1, y1, …]
 * @param {Float32Array} cov
 * @returns {[number, number, number, number] | null}
 */
function rasterize(rings, cov) {
	let minX = Infinity;
	let minY = Infinity;
	let maxX = -Infinity;
	let maxY = -Infinity;
	for (const r of rings)
		for (let i = 0; i < r.length; i += 2) {
			if (r[i] < minX) minX = r[i];
			if (r[i] > maxX) maxX = r[i];
			if (r[i + 1] < minY) minY = r[i + 1];
			if (r[i + 1] > maxY) maxY = r[i + 1];
		}
	const j0 = Math.max(0, Math.floor(minY));
	const j1 = Math.min(N, Math.ceil(maxY));
	const i0 = Math.max(0, Math.floor(minX));
	const i1 = Math.min(N, Math.ceil(maxX));
	if (j0 >= j1 || i0 >= i1) return null;
	const xs = XS;
	const ws = WS;
	for (let j = j0; j < j1; j++) {
		const row = j * N;
		for (let k = 0; k < 4; k++) {
			const sy = j + (k + 0.5) / 4;
			let n = 0;
			for (const r of rings) {
				const m = r.length;
				for (let i = 0; i < m; i += 2) {
					const ax = r[i];
					const ay = r[i + 1];
					const bx = r[(i + 2) % m];
					const by = r[(i + 3) % m];
					if (ay <= sy !== by <= sy) {
						// Insertion keeps the few crossings of a scanline sorted as they come.
						const x = ax + ((sy - ay) * (bx - ax)) / (by - ay);
						const wd = by > ay ? 1 : -1;
						let q = n++;
						while (q > 0 && xs[q - 1] > x) {
							xs[q] = xs[q - 1];
							ws[q] = ws[q - 1];
							q--;
						}
						xs[q] = x;
						ws[q] = wd;
					}
				}
			}
			let wind = 0;
			let start = 0;
			for (let q = 0; q < n; q++) {
				const prev = wind;
				wind += ws[q];
				if (prev === 0 && wind !== 0) start = xs[q];
				else if (prev !== 0 && wind === 0) span(cov, row, start, xs[q]);
			}
		}
	}
	return [i0, j0, i1, j1];
}
const XS = new Float64Array(4096);
const WS = new Int8Array(4096);

/** @param {Float32Array} cov @param {number} row @param {number} xa @param {number} xb */
function span(cov, row, xa, xb) {
	if (xa < 0) xa = 0;
	if (xb > N) xb = N;
	if (xb <= xa) return;
	const ia = Math.floor(xa);
	const ib = Math.floor(xb);
	if (ia === ib) {
		cov[row + ia] += (xb - xa) * 0.25;
		return;
	}
	cov[row + ia] += (ia + 1 - xa) * 0.25;
	for (let i = ia + 1; i < ib; i++) cov[row + i] += 0.25;
	if (ib < N) cov[row + ib] += (xb - ib) * 0.25;
}

// ---------------------------------------------------------------------------------------------
// Tile rendering

/** @type {Prepared | undefined} */
let defaultScene;
function sceneForDefault() {
	defaultScene ??= prepareScene(JSON.parse(readFileSync(SCENE_FILE, 'utf8')));
	return defaultScene;
}

// Work buffers, reused tile after tile (each render leaves them as it found them).
const IMG = new Float32Array(N * N * 3);
const COV = new Float32Array(N * N);
const ACC = new Float32Array(N * N * 4);
const LAWN_COV = new Float32Array(N * N);
const LAWN_ID = new Int16Array(N * N);
const ROAD_SD = new Float32Array(N * N).fill(Infinity);
const ROAD_D = new Float32Array(N * N);
const ROAD_HW = new Float32Array(N * N);
const WALK_C = new Float32Array(N * N);
const WALK_A = new Float32Array(N * N);
const WALK_AL = new Float32Array(N * N);
const ST_D = new Float32Array(N * N).fill(Infinity);
const ST_END = new Uint8Array(N * N);

/**
 * Renders one 256 × 256 tile to RGBA pixels.
 * @param {number} z @param {number} x @param {number} y
 * @param {Prepared} [scene] defaults to geodata/scene.geojson
 * @returns {{ width: number, height: number, data: Uint8ClampedArray }}
 */
export function renderTile(z, x, y, scene = sceneForDefault()) {
	const S = scene;
	const scale = 2 ** z;
	const [lon0, lat0] = S.origin;
	// Pixel-centre positions in metres: longitude depends on the column only, latitude on the row.
	const X = new Float64Array(N);
	const Y = new Float64Array(N);
	for (let i = 0; i < N; i++) {
		const lon = ((x + (i + 0.5) / N) / scale) * 360 - 180;
		X[i] = (lon - lon0) * S.kx;
		const my = (y + (i + 0.5) / N) / scale;
		const lat = (Math.atan(Math.sinh(Math.PI * (1 - 2 * my))) * 180) / Math.PI;
		Y[i] = (lat - lat0) * S.ky;
	}
	const mpp = Math.abs(X[1] - X[0]);
	const hp = mpp / 2;
	const tileBox = {
		minX: X[0] - mpp,
		maxX: X[N - 1] + mpp,
		minY: Y[N - 1] - mpp,
		maxY: Y[0] + mpp
	};
	const gx0 = x * N;
	const gy0 = y * N;
	const img = IMG;
	const cov = COV;
	const G = groundNoise(X, Y, mpp);

	/** Pixel rectangle [i0, j0, i1, j1) of a metre box, or null. @param {Box} b */
	const range = (b) => {
		const i0 = Math.max(0, Math.floor((b.minX - X[0]) / mpp));
		const i1 = Math.min(N, Math.ceil((b.maxX - X[0]) / mpp) + 1);
		let j0 = 0;
		while (j0 < N && Y[j0] > b.maxY) j0++;
		let j1 = j0;
		while (j1 < N && Y[j1] >= b.minY) j1++;
		return i0 < i1 && j0 < j1 ? [i0, j0, i1, j1] : null;
	};

	/** @param {P2[]} ring mercator @returns {Float64Array} */
	const toPx = (ring) => {
		const out = new Float64Array(ring.length * 2);
		for (let k = 0; k < ring.length; k++) {
			out[2 * k] = (ring[k][0] * scale - x) * N;
			out[2 * k + 1] = (ring[k][1] * scale - y) * N;
		}
		return out;
	};

	/**
	 * Rasterises rings, hands each covered pixel to `shade` (which writes C), blends it over the
	 * image by its coverage, and clears the coverage it used.
	 * @param {P2[][]} rings @param {(i: number, j: number) => void} shade
	 */
	const fill = (rings, shade) => {
		const bb = rasterize(rings.map(toPx), cov);
		if (!bb) return;
		const [i0, j0, i1, j1] = bb;
		for (let j = j0; j < j1; j++)
			for (let i = i0; i < i1; i++) {
				const idx = j * N + i;
				const c = cov[idx];
				if (c <= 0) continue;
				cov[idx] = 0;
				shade(i, j);
				blend(img, idx * 3, c);
			}
	};

	/** Darkens by a shadow's coverage. @param {P2[][]} rings @param {number} strength */
	const shadow = (rings, strength) => {
		const bb = rasterize(rings.map(toPx), cov);
		if (!bb) return;
		const [i0, j0, i1, j1] = bb;
		for (let j = j0; j < j1; j++)
			for (let i = i0; i < i1; i++) {
				const idx = j * N + i;
				let c = cov[idx];
				if (c <= 0) continue;
				cov[idx] = 0;
				if (c > 1) c = 1;
				darken(img, idx * 3, c * strength);
			}
	};

	// 1. Ground: parcel lawns where there are parcels, rough grass and scrub everywhere else,
	// so the map has no holes. Coverage first, so each pixel is shaded once or twice, not more.
	const lawnFeatures = S.lawns;
	for (let k = 0; k < lawnFeatures.length; k++) {
		const l = lawnFeatures[k];
		if (l.props.kind !== 'parcel' || !overlaps(l.box, tileBox)) continue;
		const bb = rasterize([toPx(l.merc)], cov);
		if (!bb) continue;
		const [i0, j0, i1, j1] = bb;
		for (let j = j0; j < j1; j++)
			for (let i = i0; i < i1; i++) {
				const idx = j * N + i;
				const c = cov[idx];
				if (c <= 0) continue;
				cov[idx] = 0;
				if (c > LAWN_COV[idx]) LAWN_ID[idx] = k;
				LAWN_COV[idx] = Math.min(1, LAWN_COV[idx] + c);
			}
	}
	for (let j = 0; j < N; j++)
		for (let i = 0; i < N; i++) {
			const idx = j * N + i;
			const o = idx * 3;
			const lc = LAWN_COV[idx];
			if (lc < 1) {
				ground(G, i, j, X[i], Y[j], mpp, null);
				img[o] = C[0];
				img[o + 1] = C[1];
				img[o + 2] = C[2];
			}
			if (lc > 0) {
				ground(G, i, j, X[i], Y[j], mpp, lawnFeatures[LAWN_ID[idx]]);
				if (lc >= 1) {
					img[o] = C[0];
					img[o + 1] = C[1];
					img[o + 2] = C[2];
				} else blend(img, o, lc);
				LAWN_COV[idx] = 0;
			}
		}

	// 2. Sidewalks, then driveways, then the asphalt over both. All streets share one distance
	// field, built segment box by segment box (so the cost follows the roads, not the tile), and
	// junctions come out as one surface with one kerb around it.
	let ru0 = N;
	let rv0 = N;
	let ru1 = 0;
	let rv1 = 0;
	for (const st of S.streets) {
		if (!overlaps(st.box, tileBox)) continue;
		const w0 = st.hw + st.verge;
		const w1 = w0 + st.walk;
		const last = st.segs.length - 1;
		let su0 = N;
		let sv0 = N;
		let su1 = 0;
		let sv1 = 0;
		// This street's own distance field first: its sidewalks follow its true offset line.
		st.segs.forEach((sg, k) => {
			const rr = overlaps(sg.box, tileBox) && range(sg.box);
			if (!rr) return;
			const [i0, j0, i1, j1] = rr;
			for (let j = j0; j < j1; j++)
				for (let i = i0; i < i1; i++) {
					const idx = j * N + i;
					const t0 = ((X[i] - sg.ax) * sg.dx + (Y[j] - sg.ay) * sg.dy) * sg.il;
					const t = t0 < 0 ? 0 : t0 > 1 ? 1 : t0;
					const ex = sg.ax + t * sg.dx - X[i];
					const ey = sg.ay + t * sg.dy - Y[j];
					const d = Math.sqrt(ex * ex + ey * ey);
					if (d < ST_D[idx]) {
						ST_D[idx] = d;
						WALK_A[idx] = sg.s0 + t * sg.len;
						// Sidewalks stop square at a street's ends, where they meet the crossing street's.
						ST_END[idx] = (k === 0 && t0 < 0) || (k === last && t0 > 1) ? 1 : 0;
					}
				}
			su0 = Math.min(su0, i0);
			sv0 = Math.min(sv0, j0);
			su1 = Math.max(su1, i1);
			sv1 = Math.max(sv1, j1);
		});
		for (let j = sv0; j < sv1; j++)
			for (let i = su0; i < su1; i++) {
				const idx = j * N + i;
				const d = ST_D[idx];
				if (d === Infinity) continue;
				ST_D[idx] = Infinity;
				if (d - st.hw < ROAD_SD[idx]) {
					ROAD_SD[idx] = d - st.hw;
					ROAD_D[idx] = d;
					ROAD_HW[idx] = st.hw;
				}
				if (st.walk > 0 && !ST_END[idx]) {
					const c = band(d, w0, w1, hp);
					if (c > WALK_C[idx]) {
						WALK_C[idx] = c;
						WALK_AL[idx] = WALK_A[idx];
					}
				}
			}
		ru0 = Math.min(ru0, su0);
		rv0 = Math.min(rv0, sv0);
		ru1 = Math.max(ru1, su1);
		rv1 = Math.max(rv1, sv1);
	}
	for (let j = rv0; j < rv1; j++)
		for (let i = ru0; i < ru1; i++) {
			const idx = j * N + i;
			const c = WALK_C[idx];
			if (c <= 0) continue;
			sidewalk(X[i], Y[j], WALK_AL[idx], mpp, gx0 + i, gy0 + j);
			blend(img, idx * 3, c);
			WALK_C[idx] = 0;
		}
	for (const dw of S.driveways) {
		if (!overlaps(dw.box, tileBox)) continue;
		fill([dw.merc], (i, j) => driveway(dw, X[i], Y[j], mpp, gx0 + i, gy0 + j));
	}
	for (let j = rv0; j < rv1; j++)
		for (let i = ru0; i < ru1; i++) {
			const idx = j * N + i;
			const sd = ROAD_SD[idx];
			if (sd === Infinity) continue;
			ROAD_SD[idx] = Infinity;
			const c = band(sd, -1e9, 0, hp);
			if (c <= 0) continue;
			asphalt(X[i], Y[j], sd, ROAD_D[idx], ROAD_HW[idx], mpp, gx0 + i, gy0 + j);
			blend(img, idx * 3, c);
		}
	// Greens come after the streets: the court's island sits inside the road's ring.
	for (const l of S.lawns) {
		if (l.props.kind !== 'lawn' || !overlaps(l.box, tileBox)) continue;
		fill([l.merc], (i, j) => ground(G, i, j, X[i], Y[j], mpp, l));
	}

	// 3. Pools with their decks.
	for (const pl of S.pools) {
		const rr = overlaps(pl.outer, tileBox) && range(pl.outer);
		if (!rr) continue;
		const [i0, j0, i1, j1] = rr;
		for (let j = j0; j < j1; j++)
			for (let i = i0; i < i1; i++) {
				let d = Infinity;
				for (const sg of pl.segs) d = Math.min(d, segDist(sg, X[i], Y[j]));
				const sd = inside(pl.ring, X[i], Y[j]) ? -d : d;
				const o = (j * N + i) * 3;
				const cDeck = band(sd, -0.2, pl.deck, hp);
				if (cDeck > 0) {
					deck(X[i], Y[j], mpp, gx0 + i, gy0 + j);
					blend(img, o, cDeck);
				}
				const cWater = band(sd, -1e9, 0, hp);
				if (cWater > 0) {
					water(X[i], Y[j], -sd, mpp);
					blend(img, o, cWater);
				}
			}
	}

	// 4. Fences: their shadow first, then the rail.
	for (const fe of S.fences) {
		const rr = overlaps(fe.box, tileBox) && range(fe.box);
		if (!rr) continue;
		// A vinyl pool fence is mostly gaps between pickets; a wood privacy fence is solid.
		shadow(fe.shadow, fe.vinyl ? 0.45 : 0.8);
		const w = fe.vinyl ? 0.07 : 0.09;
		const [i0, j0, i1, j1] = rr;
		for (let j = j0; j < j1; j++)
			for (let i = i0; i < i1; i++) {
				let d = Infinity;
				for (const sg of fe.segs) d = Math.min(d, segDist(sg, X[i], Y[j]));
				const c = band(d, -w, w, hp);
				if (c <= 0) continue;
				const v = 0.94 + 0.1 * (hash2(gx0 + i, gy0 + j, 7) - 0.5);
				if (fe.vinyl) setC(0.9 * v, 0.9 * v, 0.88 * v);
				else setC(0.5 * v, 0.4 * v, 0.29 * v);
				blend(img, (j * N + i) * 3, c);
			}
	}

	// 5. Shrubs, low enough that roofs cover any that tuck under an eave.
	for (const sb of S.shrubs) if (overlaps(sb.box, tileBox)) treeShadow(sb, false);
	for (const sb of S.shrubs) if (overlaps(sb.box, tileBox)) crown(sb, true);

	// 6. Building shadows on the ground, then the roofs.
	for (const h of S.houses) if (overlaps(h.shadowBox, tileBox)) shadow(h.shadow, 1);
	const acc = ACC;
	for (const h of S.houses) {
		if (!overlaps(h.box, tileBox)) continue;
		let bi0 = N;
		let bj0 = N;
		let bi1 = 0;
		let bj1 = 0;
		for (const f of h.facets) {
			if (!overlaps(f.box, tileBox)) continue;
			const bb = rasterize([toPx(f.merc)], cov);
			if (!bb) continue;
			const [i0, j0, i1, j1] = bb;
			bi0 = Math.min(bi0, i0);
			bj0 = Math.min(bj0, j0);
			bi1 = Math.max(bi1, i1);
			bj1 = Math.max(bj1, j1);
			for (let j = j0; j < j1; j++)
				for (let i = i0; i < i1; i++) {
					const idx = j * N + i;
					const c = cov[idx];
					if (c <= 0) continue;
					cov[idx] = 0;
					facetColour(f, X[i], Y[j], mpp, gx0 + i, gy0 + j);
					const sh = roofShadow(h.facets, f, X[i], Y[j]);
					if (sh > 0) {
						C[0] *= 1 - sh * (1 - SHADOW_TINT[0]);
						C[1] *= 1 - sh * (1 - SHADOW_TINT[1]);
						C[2] *= 1 - sh * (1 - SHADOW_TINT[2]);
					}
					const a = idx * 4;
					acc[a] += C[0] * c;
					acc[a + 1] += C[1] * c;
					acc[a + 2] += C[2] * c;
					acc[a + 3] += c;
				}
		}
		// Facets of one house add up, then go over the ground once: no seams between them.
		for (let j = bj0; j < bj1; j++)
			for (let i = bi0; i < bi1; i++) {
				const idx = j * N + i;
				const a = idx * 4;
				const c = acc[a + 3];
				if (c <= 0) continue;
				const o = idx * 3;
				if (c >= 1) {
					img[o] = acc[a] / c;
					img[o + 1] = acc[a + 1] / c;
					img[o + 2] = acc[a + 2] / c;
				} else {
					img[o] = img[o] * (1 - c) + acc[a];
					img[o + 1] = img[o + 1] * (1 - c) + acc[a + 1];
					img[o + 2] = img[o + 2] * (1 - c) + acc[a + 2];
				}
				acc[a] = acc[a + 1] = acc[a + 2] = acc[a + 3] = 0;
			}
	}

	// 7. Trees last: their soft shadows fall across lawns and roofs alike, then the crowns.
	for (const t of S.trees) if (overlaps(t.box, tileBox)) treeShadow(t, true);
	for (const t of S.trees) if (overlaps(t.box, tileBox)) crown(t, false);

	// A camera looking down through a few hundred metres of air: a little haze, a little less
	// saturation than the surfaces have.
	const data = new Uint8ClampedArray(N * N * 4);
	for (let k = 0, o = 0; k < N * N; k++, o += 3) {
		const l = 0.3 * img[o] + 0.59 * img[o + 1] + 0.11 * img[o + 2];
		data[k * 4] = Math.round((img[o] * 0.86 + l * 0.08 + HAZE[0] * 0.06) * 255);
		data[k * 4 + 1] = Math.round((img[o + 1] * 0.86 + l * 0.08 + HAZE[1] * 0.06) * 255);
		data[k * 4 + 2] = Math.round((img[o + 2] * 0.86 + l * 0.08 + HAZE[2] * 0.06) * 255);
		data[k * 4 + 3] = 255;
	}
	return { width: N, height: N, data };

	/**
	 * @param {{ X: number, Y: number, r: number, sx: number, sy: number, seed: number, box: Box }} t
	 * @param {boolean} trunk
	 */
	function treeShadow(t, trunk) {
		const rr = range(t.box);
		if (!rr) return;
		const [i0, j0, i1, j1] = rr;
		const [ux, uy] = SHADOW_DIR;
		const ul = Math.hypot(ux, uy);
		const ax = ux / ul;
		const ay = uy / ul;
		// A round crown's shadow stretches along the sun's direction by 1/sin(elevation).
		const ra = t.r * 1.3;
		const rb = t.r * 0.95;
		const span = Math.hypot(t.sx - t.X, t.sy - t.Y);
		for (let j = j0; j < j1; j++) {
			const dy = Y[j] - t.sy;
			for (let i = i0; i < i1; i++) {
				const dx = X[i] - t.sx;
				const p = dx * ax + dy * ay;
				const q = -dx * ay + dy * ax;
				const rho = Math.sqrt((p / ra) ** 2 + (q / rb) ** 2);
				if (rho > 1.3 && !trunk) continue;
				const wob = 0.12 * (vnoise(X[i] / 1.3, Y[j] / 1.3, t.seed) - 0.5);
				let c = smoothstep(1.12, 0.82, rho + wob);
				if (trunk) {
					// Trunk shadow from the foot of the tree to the crown's shadow.
					const tx = X[i] - t.X;
					const ty = Y[j] - t.Y;
					const along = tx * ax + ty * ay;
					if (along > 0 && along < span)
						c = Math.max(c, band(Math.abs(-tx * ay + ty * ax), -0.16, 0.16, hp) * 0.8);
				}
				if (c <= 0.002) continue;
				// Light leaks through foliage, so its shadow is dappled and lighter than a wall's.
				c *= 0.7 + 0.2 * vnoise(X[i] / 0.5, Y[j] / 0.5, t.seed + 3);
				darken(img, (j * N + i) * 3, c);
			}
		}
	}

	/**
	 * A lumpy dome of foliage, lit from the sun's side.
	 * @param {{ X: number, Y: number, r: number, h: number, conifer: boolean, seed: number, tint: number[] }} t
	 * @param {boolean} shrub
	 */
	function crown(t, shrub) {
		const R = t.r * 1.15;
		const rr = range({ minX: t.X - R, maxX: t.X + R, minY: t.Y - R, maxY: t.Y + R });
		if (!rr) return;
		const [i0, j0, i1, j1] = rr;
		const base = t.conifer ? [0.12, 0.22, 0.11] : shrub ? [0.17, 0.29, 0.11] : [0.19, 0.31, 0.12];
		const tr = base[0] * (1 + 0.25 * t.tint[0]);
		const tg = base[1] * (1 + 0.15 * t.tint[1]);
		const tb = base[2];
		// Clusters scale with the crown (a big oak has big masses of foliage), leaves within them.
		const lump = Math.max(0.25, t.r * (t.conifer ? 0.22 : 0.3));
		const leaf = Math.min(0.35, lump * 0.35);
		const lc = lod(lump, mpp);
		const ll = lod(leaf, mpp);
		for (let j = j0; j < j1; j++) {
			const dy = Y[j] - t.Y;
			for (let i = i0; i < i1; i++) {
				const dx = X[i] - t.X;
				const d = Math.sqrt(dx * dx + dy * dy);
				if (d > R + mpp) continue;
				// Foliage masses: the nearest of a jittered grid of centres, each a dome of its own
				// size, lit on its sun side and dark in the hollows between.
				const u = X[i] / lump;
				const w = Y[j] / lump;
				const iu = Math.floor(u);
				const iw = Math.floor(w);
				let best = 9;
				let bx = 0;
				let by = 0;
				let br = 0.6;
				for (let dj = -1; dj <= 1; dj++)
					for (let di = -1; di <= 1; di++) {
						const cx = iu + di;
						const cy = iw + dj;
						const rad = 0.5 + 0.35 * hash2(cx, cy, t.seed + 5);
						const ex = u - (cx + 0.1 + 0.8 * hash2(cx, cy, t.seed));
						const ey = w - (cy + 0.1 + 0.8 * hash2(cx, cy, t.seed + 1));
						const e2 = (ex * ex + ey * ey) / (rad * rad);
						if (e2 < best) {
							best = e2;
							bx = ex / rad;
							by = ey / rad;
							br = rad;
						}
					}
				const q = Math.min(1, Math.sqrt(best));
				const gap = smoothstep(0.6, 1, q) * lc;
				const edge =
					t.r * (1 + 0.12 * (vnoise(X[i] / (t.r * 0.5), Y[j] / (t.r * 0.5), t.seed) - 0.5)) -
					gap * lump * br * 0.5;
				const c = Math.min(1, Math.max(0, (edge - d) / mpp + 0.5));
				if (c <= 0) continue;
				const rr2 = Math.min(1, d / t.r);
				const dn = Math.sqrt(Math.max(0.05, 1 - rr2 * rr2 * 0.75));
				const cz = Math.sqrt(Math.max(0, 1 - q * q));
				const nx = (dx / t.r) * 0.55 + bx * 0.45 * lc;
				const ny = (dy / t.r) * 0.55 + by * 0.45 * lc;
				const nz = dn * 0.55 + cz * 0.45 * lc + 0.45 * (1 - lc);
				const nl =
					(nx * SUN_L[0] + ny * SUN_L[1] + nz * SUN_L[2]) / Math.sqrt(nx * nx + ny * ny + nz * nz);
				const lf = vnoise(X[i] / leaf, Y[j] / leaf, t.seed + 2);
				const leafy = 1 + (lf - 0.5) * 0.45 * ll - 0.25 * ll * smoothstep(0.8, 1, 1 - lf);
				let v = (0.28 + 0.85 * Math.max(0, nl)) * (1 - 0.45 * gap) * leafy;
				if (lc < 1) v *= 1 - 0.12 * (1 - lc);
				if (t.conifer) v *= 0.92 + 0.16 * Math.cos(Math.atan2(dy, dx) * 11 + lf * 4);
				setC(tr * v, tg * v, tb * v);
				blend(img, (j * N + i) * 3, c);
			}
		}
	}
}

/** Shader output, shared to keep the inner loops free of allocation. */
const C = new Float32Array(3);

/** @param {number} r @param {number} g @param {number} b */
function setC(r, g, b) {
	C[0] = r;
	C[1] = g;
	C[2] = b;
}

/** Multiplies toward the bluish shadow tint by coverage c. @param {Float32Array} img @param {number} o @param {number} c */
function darken(img, o, c) {
	img[o] *= 1 - c * (1 - SHADOW_TINT[0]);
	img[o + 1] *= 1 - c * (1 - SHADOW_TINT[1]);
	img[o + 2] *= 1 - c * (1 - SHADOW_TINT[2]);
}

/** @param {Float32Array} img @param {number} o @param {number} c */
function blend(img, o, c) {
	if (c > 1) c = 1;
	img[o] += (C[0] - img[o]) * c;
	img[o + 1] += (C[1] - img[o + 1]) * c;
	img[o + 2] += (C[2] - img[o + 2]) * c;
}

// ---------------------------------------------------------------------------------------------
// Surface shaders (write C)

/** @param {Float64Array} X @param {Float64Array} Y @param {number} mpp */
function groundNoise(X, Y, mpp) {
	return {
		big: gridNoise(X, Y, 14, 11, mpp, NOISE2),
		field: gridNoise(X, Y, 40, 17, mpp),
		mid: gridNoise(X, Y, 1.3, 13, mpp),
		fine: gridNoise(X, Y, 0.32, 14, mpp, NOISE2),
		bare: gridNoise(X, Y, 3.2, 16, mpp)
	};
}

/**
 * Grass. Without a lawn it is the rough ground between parcels: patchier, drier, no mowing.
 * @param {ReturnType<typeof groundNoise>} G @param {number} i @param {number} j
 * @param {number} X @param {number} Y @param {number} mpp
 * @param {{ props: Record<string, any>, rnd: number[], seed: number } | null} lawn
 */
function ground(G, i, j, X, Y, mpp, lawn) {
	const big = gn(G.big, i, j);
	const mid = gl(G.mid, i, j);
	const fine = gl(G.fine, i, j);
	let r;
	let g;
	let b;
	if (lawn) {
		const t = LAWNS[lawn.props.lawn] ?? LAWNS.fresh;
		const yellow = smoothstep(0.5, 1, big) * 0.3;
		r = t[0] + (0.44 - t[0]) * yellow;
		g = t[1] + (0.44 - t[1]) * yellow;
		b = t[2] + (0.27 - t[2]) * yellow;
		const k = 0.92 + 0.1 * (big - 0.5) + 0.08 * (mid - 0.5) + 0.1 * (fine - 0.5);
		// Mowing stripes: each lawn mown in its own direction, a few percent light and dark.
		const sl = lod(1.9, mpp);
		let stripe = 1;
		if (sl > 0) {
			const st = Math.sin(((X * lawn.rnd[1] + Y * lawn.rnd[2]) / 0.95) * Math.PI);
			stripe = 1 + 0.018 * sl * Math.max(-1, Math.min(1, st * 2));
		}
		r *= k * stripe;
		g *= k * stripe;
		b *= k * stripe;
	} else {
		const dry = smoothstep(0.25, 0.85, 0.5 * big + 0.5 * gn(G.field, i, j)) * 0.7;
		const bare = smoothstep(0.88, 1, gn(G.bare, i, j)) * 0.35;
		r = 0.34 + 0.1 * dry + 0.08 * bare;
		g = 0.38 + 0.035 * dry - 0.01 * bare;
		b = 0.21 + 0.055 * dry + 0.06 * bare;
		const k = 0.9 + 0.12 * (mid - 0.5) + 0.14 * (fine - 0.5);
		r *= k;
		g *= k;
		b *= k;
	}
	setC(r, g, b);
}

/** @param {number} X @param {number} Y @param {number} along @param {number} mpp @param {number} gx @param {number} gy */
function sidewalk(X, Y, along, mpp, gx, gy) {
	const n = lodNoise(X, Y, 0.9, 21, mpp);
	const grain = 1 + 0.05 * (hash2(gx, gy, 3) - 0.5);
	// Expansion joints every 1.5 m across the walk.
	const f = along / 1.5 - Math.floor(along / 1.5);
	const joint = 1 - 0.25 * band(f * 1.5, 0, 0.025, mpp / 2) * 2;
	const v = (0.9 + 0.12 * n) * grain * joint;
	setC(0.7 * v, 0.69 * v, 0.66 * v);
}

/**
 * @param {number} X @param {number} Y @param {number} sd signed distance to the road's edge
 * @param {number} d distance to the nearest street's centre line @param {number} hw its half-width
 * @param {number} mpp @param {number} gx @param {number} gy
 */
function asphalt(X, Y, sd, d, hw, mpp, gx, gy) {
	if (sd > -0.35) {
		// Concrete gutter pan along the kerb.
		const v = 0.95 + 0.06 * (hash2(gx, gy, 5) - 0.5);
		setC(0.63 * v, 0.62 * v, 0.59 * v);
		return;
	}
	const patch = vnoise(X / 6, Y / 6, 31);
	const n = lodNoise(X, Y, 0.7, 32, mpp);
	const grain = 1 + 0.08 * (hash2(gx, gy, 4) - 0.5);
	// Tyres polish two darker paths in each lane; drips darken the lane centre.
	const lane = Math.abs(d - hw / 2);
	const wear =
		1 - 0.06 * smoothstep(0.9, 0.3, Math.abs(lane - 0.8)) - 0.05 * smoothstep(0.5, 0, lane);
	const v = (0.88 + 0.14 * patch + 0.08 * (n - 0.5)) * grain * wear;
	setC(0.36 * v, 0.36 * v, 0.375 * v);
}

/**
 * @param {{ props: Record<string, any>, dir: number[], cx: number, cy: number, seed: number }} dw
 * @param {number} X @param {number} Y @param {number} mpp @param {number} gx @param {number} gy
 */
function driveway(dw, X, Y, mpp, gx, gy) {
	const u = (X - dw.cx) * dw.dir[0] + (Y - dw.cy) * dw.dir[1];
	const w = -(X - dw.cx) * dw.dir[1] + (Y - dw.cy) * dw.dir[0];
	const grain = 1 + 0.06 * (hash2(gx, gy, 6) - 0.5);
	const n = lodNoise(X, Y, 0.8, dw.seed, mpp);
	const stain = vnoise(X / 2.5, Y / 2.5, dw.seed + 1);
	const tyres = 1 - 0.07 * smoothstep(0.45, 0.1, Math.abs(Math.abs(w) - 0.8)) * (0.6 + 0.8 * stain);
	const surface = dw.props.surface;
	if (surface === 'asphalt') {
		const v = (0.9 + 0.12 * n) * grain * tyres;
		setC(0.31 * v, 0.31 * v, 0.32 * v);
	} else if (surface === 'pavers') {
		// Running-bond brick pavers, 0.2 × 0.1 m, joints swept with pale sand.
		const row = Math.floor(w / 0.1);
		const uu = u / 0.2 + (row & 1) * 0.5;
		const fu = (uu - Math.floor(uu)) * 0.2;
		const fw = (w / 0.1 - row) * 0.1;
		const jl = lod(0.1, mpp);
		const joint = Math.max(band(fu, 0, 0.012, mpp / 2), band(fw, 0, 0.012, mpp / 2)) * jl;
		const tone = 1 + 0.16 * (hash2(Math.floor(uu), row, dw.seed) - 0.5) * lod(0.2, mpp);
		const v = (0.92 + 0.1 * n) * grain * tone * tyres;
		const r = 0.58 * v;
		const g = 0.42 * v;
		const b = 0.35 * v;
		setC(r + (0.75 - r) * joint, g + (0.7 - g) * joint, b + (0.6 - b) * joint);
	} else {
		// Poured concrete with sawn joints on a 3 m grid.
		const fu = u / 3 - Math.floor(u / 3);
		const joint = 1 - 0.3 * band(Math.min(fu, 1 - fu) * 3, 0, 0.015, mpp / 2);
		const v = (0.9 + 0.1 * n + 0.05 * (stain - 0.5)) * grain * tyres * joint;
		setC(0.73 * v, 0.71 * v, 0.67 * v);
	}
}

/** @param {number} X @param {number} Y @param {number} mpp @param {number} gx @param {number} gy */
function deck(X, Y, mpp, gx, gy) {
	const fx = X / 0.6 - Math.floor(X / 0.6);
	const fy = Y / 0.6 - Math.floor(Y / 0.6);
	const joint = Math.max(
		band(Math.min(fx, 1 - fx) * 0.6, 0, 0.01, mpp / 2),
		band(Math.min(fy, 1 - fy) * 0.6, 0, 0.01, mpp / 2)
	);
	const tone =
		1 + 0.06 * (hash2(Math.floor(X / 0.6), Math.floor(Y / 0.6), 41) - 0.5) * lod(0.6, mpp);
	const v = (1 - 0.2 * joint) * tone * (1 + 0.04 * (hash2(gx, gy, 8) - 0.5));
	setC(0.82 * v, 0.78 * v, 0.7 * v);
}

/** @param {number} X @param {number} Y @param {number} depthIn metres in from the rim @param {number} mpp */
function water(X, Y, depthIn, mpp) {
	const deep = smoothstep(0.1, 1.8, depthIn);
	const tileBand = band(depthIn, 0, 0.16, mpp / 2);
	// Sunlight focused by ripples: bright wavy lines on the floor.
	const c1 = vnoise(X / 0.55, Y / 0.55, 51);
	const c2 = vnoise(X / 0.38 + 3.1, Y / 0.38, 52);
	const caustic = smoothstep(0.08, 0, Math.abs(c1 - c2)) * lod(0.4, mpp) * 0.12;
	const r = 0.42 + (0.1 - 0.42) * deep + caustic;
	const g = 0.78 + (0.5 - 0.78) * deep + caustic;
	const b = 0.84 + (0.68 - 0.84) * deep + caustic * 0.6;
	setC(r + (0.14 - r) * tileBand, g + (0.3 - g) * tileBand, b + (0.46 - b) * tileBand);
}

/**
 * Whether another facet of the same house stands between this roof point and the sun (a dormer
 * shading the slope behind it, a main roof over a lower wing). Facets are planes, so the sun ray
 * meets each one at a single, solvable distance; the point is in shadow when that meeting point
 * lies inside the other facet's outline.
 * @param {Prepared['facets']} facets @param {Prepared['facets'][number]} f
 * @param {number} X @param {number} Y
 */
function roofShadow(facets, f, X, Y) {
	if (facets.length < 2) return 0;
	const h = f.eaveH + ((f.e0[0] - X) * f.down[0] + (f.e0[1] - Y) * f.down[1]) * f.rise;
	for (const g of facets) {
		if (g === f) continue;
		const hg = g.eaveH + ((g.e0[0] - X) * g.down[0] + (g.e0[1] - Y) * g.down[1]) * g.rise;
		const den = SUN_L[2] + g.rise * (g.down[0] * SUN_L[0] + g.down[1] * SUN_L[1]);
		if (den < 0.05) continue;
		const tau = (hg - h) / den;
		// Points right at a shared edge would otherwise flicker between lit and shaded.
		if (tau < 0.03) continue;
		const qx = X + tau * SUN_L[0];
		const qy = Y + tau * SUN_L[1];
		if (qx < g.box.minX || qx > g.box.maxX || qy < g.box.minY || qy > g.box.maxY) continue;
		if (inside(g.ring, qx, qy)) return 0.85;
	}
	return 0;
}

/**
 * Lighting of a facet's surface tilted by `tilt` radians about its down-slope axis (the sides of
 * a barrel tile), relative to flat ground.
 * @param {{ nDotL: number, bright: number }} f @param {number} aDotL @param {number} tilt
 */
function tilted(f, aDotL, tilt) {
	if (tilt === 0) return f.bright;
	const tn = Math.tan(tilt);
	return light((f.nDotL + tn * aDotL) / Math.sqrt(1 + tn * tn)) / FLAT_LIGHT;
}

const ALGAE = [0.08, 0.075, 0.065];
const MOSS = [0.2, 0.24, 0.09];
const LICHEN = [0.6, 0.62, 0.52];

/**
 * One roof facet at one point: material texture lit by the facet's orientation, caps on ridges
 * and hips, flashing in valleys, gutters on eaves, and growth by grade.
 * @param {Prepared['facets'][number]} f
 * @param {number} X @param {number} Y @param {number} mpp @param {number} gx @param {number} gy
 */
function facetColour(f, X, Y, mpp, gx, gy) {
	const hp = mpp / 2;
	const rx = X - f.e0[0];
	const ry = Y - f.e0[1];
	const s = rx * f.along[0] + ry * f.along[1];
	const t = Math.max(0, -(rx * f.down[0] + ry * f.down[1]));
	const ts = t * f.mult;
	const seed = f.seed;
	const ax = f.along[0];
	const ay = f.along[1];
	const aDotL = ax * SUN_L[0] + ay * SUN_L[1];
	let r = f.shade[0];
	let g = f.shade[1];
	let b = f.shade[2];
	let v = 1;
	let lightK = f.bright;
	let spec = 0;
	const grain = 1 + 0.05 * (hash2(gx, gy, 9) - 0.5);

	switch (MATERIALS[f.material]) {
		case 'asphalt_shingle': {
			// Laminated shingles: 143 mm courses, tabs of random width, some with dark shadow
			// bands where the second layer shows, granules mottled tab by tab.
			const E = 0.143;
			const k = Math.floor(ts / E);
			const fy = ts / E - k;
			const q = Math.floor((s + hash2(k, 1, seed) * 0.6) / 0.21);
			const h = hash2(q, k, seed);
			const lt = lod(0.2, mpp);
			const lc = lod(E / f.mult, mpp);
			v *= 1 + (h - 0.5) * 0.24 * lt;
			if (h < 0.35) v *= 1 - 0.18 * lt * smoothstep(0.45, 0.3, fy);
			v *= 1 - 0.2 * lc * smoothstep(0.22, 0, fy);
			break;
		}
		case 'clay_tile': {
			// Barrel (S) tile: 240 mm pans and covers, 330 mm courses; each course's butt throws
			// a shadow line, troughs sit in their own shade, crests catch the sun.
			const E = 0.33;
			const W = 0.24;
			const k = Math.floor(ts / E);
			const fy = ts / E - k;
			const u = s / W - Math.floor(s / W);
			const lw = lod(W, mpp);
			lightK = tilted(f, aDotL, 0.8 * Math.cos(2 * Math.PI * u) * lw);
			v *= 1 - 0.2 * lw * Math.max(0, -Math.sin(2 * Math.PI * u));
			v *= 1 - 0.25 * lod(E / f.mult, mpp) * smoothstep(0.14, 0, fy);
			v *= 1 + (hash2(Math.floor(s / W), k, seed) - 0.5) * 0.2 * lw;
			break;
		}
		case 'concrete_tile': {
			const E = 0.33;
			const W = 0.3;
			const k = Math.floor(ts / E);
			const fy = ts / E - k;
			const u = s / W - Math.floor(s / W);
			const lw = lod(W, mpp);
			lightK = tilted(f, aDotL, 0.35 * Math.cos(2 * Math.PI * u) * lw);
			v *= 1 - 0.3 * lod(E / f.mult, mpp) * smoothstep(0.16, 0, fy);
			v *= 1 + (hash2(Math.floor(s / W), k, seed) - 0.5) * 0.1 * lw;
			v *= 0.92 + 0.16 * lodNoise(X, Y, 0.6, seed + 5, mpp);
			break;
		}
		case 'metal': {
			// Standing seams every 420 mm running up the slope; each seam is lit on one side.
			const W = 0.42;
			const u = s / W - Math.floor(s / W);
			const du = Math.min(u, 1 - u) * W;
			const ls = lod(W, mpp);
			const side = u < 0.5 ? 1 : -1;
			const seam = band(du, 0, 0.022, hp);
			v *= 1 + seam * ls * 0.45 * Math.sign(aDotL || 1) * side;
			v *= 1 + (hash2(Math.floor(s / W), 3, seed) - 0.5) * 0.05 * ls;
			v *= 1 + (lodNoise(s, ts / 12, 0.25, seed + 6, mpp) - 0.5) * 0.06;
			const hx = SUN_L[0];
			const hy = SUN_L[1];
			const hz = SUN_L[2] + 1;
			const hl = Math.hypot(hx, hy, hz);
			const nh = (f.normal[0] * hx + f.normal[1] * hy + f.normal[2] * hz) / hl;
			spec = Math.pow(Math.max(0, nh), 40) * 0.25;
			break;
		}
		case 'slate': {
			// 190 mm exposure, 300 mm slates set half a slate over from the course below.
			const E = 0.19;
			const W = 0.3;
			const k = Math.floor(ts / E);
			const fy = ts / E - k;
			const uu = s / W + (k & 1) * 0.5;
			const q = Math.floor(uu);
			const fu = (uu - q) * W;
			const lw = lod(W, mpp);
			const h = hash2(q, k, seed);
			v *= 1 + (h - 0.5) * 0.28 * lw;
			b *= 1 + (hash2(q, k, seed + 1) - 0.5) * 0.12 * lw;
			v *= 1 - 0.45 * band(Math.min(fu, W - fu), 0, 0.008, hp) * lod(0.06, mpp);
			v *= 1 - 0.25 * lod(E / f.mult, mpp) * smoothstep(0.12, 0, fy);
			break;
		}
		case 'wood_shake': {
			// Split shakes of uneven width (100–300 mm) on 240 mm courses, heavy butt shadows, thin
			// keyways, grain running down the slope, silvering unevenly from shake to shake.
			const E = 0.24;
			const k = Math.floor(ts / E);
			const fy = ts / E - k;
			const uu = (s + hash2(k, 2, seed) * 0.9) / 0.1;
			const cell = Math.floor(uu);
			// Merge runs of 0.1 m cells into shakes: a new shake starts where the hash says so.
			let q = cell;
			while (hash2(q, k, seed + 3) > 0.45 && cell - q < 3) q--;
			const fu = (uu - q) * 0.1;
			const lw = lod(0.2, mpp);
			v *= 1 + (hash2(q, k, seed) - 0.5) * 0.4 * lw;
			v *= 1 + (lodNoise(s * 6, ts, 0.4, seed + 7, mpp) - 0.5) * 0.14 * lw;
			v *= 1 - 0.35 * band(fu, 0, 0.012, hp) * lod(0.05, mpp);
			v *= 1 - 0.32 * lod(E / f.mult, mpp) * smoothstep(0.22, 0, fy);
			break;
		}
	}

	// Ridge and hip caps: a rounded course that faces up, so it is lit like flat ground.
	let capD = Infinity;
	for (const c of f.caps) capD = Math.min(capD, segDist(c, X, Y));
	const porch = f.section === 'porch';
	const capW = porch ? 0.06 : MATERIALS[f.material] === 'metal' ? 0.14 : 0.17;
	const cap = band(capD, 0, capW, hp);
	let valD = Infinity;
	for (const c of f.valleys) valD = Math.min(valD, segDist(c, X, Y));
	const valley = band(valD, 0, MATERIALS[f.material] === 'asphalt_shingle' ? 0.05 : 0.12, hp);
	let eaveD = Infinity;
	for (const c of f.eaves) eaveD = Math.min(eaveD, segDist(c, X, Y));
	const gutter = f.gutters ? band(eaveD, 0, 0.13, hp) : 0;
	const drip = band(eaveD, 0, 0.03, hp);
	let rakeD = Infinity;
	for (const c of f.rakes) rakeD = Math.min(rakeD, segDist(c, X, Y));
	const rake = band(rakeD, 0, 0.05, hp);

	// Growth: dark algae streaks that run down the slope and thicken toward the eave, moss
	// cushions and pale lichen on the worst facets, all heavier where the sun reaches less.
	const G = f.growth;
	let dark = 0;
	let moss = 0;
	let lichen = 0;
	if (G > 0) {
		const shadeK = Math.min(1.4, Math.max(0.75, 1 + 0.8 * (0.6 - f.nDotL)));
		const runS = f.runMax * f.mult;
		const lowness = Math.min(1, Math.max(0, 1 - ts / runS));
		const ns =
			vnoise(s / 0.4, ts / 4.5, seed + 11) * 0.65 + vnoise(s / 0.14, ts / 1.6, seed + 12) * 0.35;
		const thr = 0.8 - 0.1 * G;
		// Each streak starts somewhere of its own up the slope and fades in below that point.
		const start = vnoise(s / 0.9, 0.5, seed + 21) * runS * 0.85;
		const begun = smoothstep(start + 0.6, start - 0.2, ts);
		const strength = 0.55 + 0.45 * vnoise(s / 0.6, ts / 8, seed + 22);
		const streak = smoothstep(thr, thr + 0.14, ns) * (0.4 + 0.6 * lowness) * begun * strength;
		const grime = 0.04 * G * (0.8 + 0.4 * vnoise(X / 3, Y / 3, seed + 13));
		dark = Math.min(0.85, (streak * (0.14 + 0.13 * G) + grime) * shadeK);
		if (G >= 3) {
			// Moss sits in cushions along the lower courses, where water lingers longest.
			const mn =
				vnoise(X / 1.1, Y / 1.1, seed + 14) * 0.6 + vnoise(X / 0.42, Y / 0.42, seed + 15) * 0.4;
			const mthr = (G === 4 ? 0.6 : 0.74) + (0.22 * (1 - lowness)) / shadeK;
			moss = smoothstep(mthr, mthr + 0.12, mn) * 0.9;
			const cx = Math.floor(X / 0.35);
			const cy = Math.floor(Y / 0.35);
			if (hash2(cx, cy, seed + 16) < 0.012 * G) {
				const px = (cx + 0.25 + 0.5 * hash2(cx, cy, seed + 17)) * 0.35;
				const py = (cy + 0.25 + 0.5 * hash2(cx, cy, seed + 18)) * 0.35;
				const rad = 0.03 + 0.04 * hash2(cx, cy, seed + 19);
				const dx = X - px;
				const dy = Y - py;
				lichen = band(Math.sqrt(dx * dx + dy * dy), 0, rad, hp) * 0.6;
			}
		}
	}

	const k = v * lightK * grain;
	r = r * k + spec;
	g = g * k + spec;
	b = b * k + spec;
	if (dark > 0) {
		r += (ALGAE[0] - r) * dark;
		g += (ALGAE[1] - g) * dark;
		b += (ALGAE[2] - b) * dark;
	}
	if (moss > 0) {
		const ml = lightK * (0.8 + 0.3 * lodNoise(X, Y, 0.15, seed + 20, mpp));
		r += (MOSS[0] * ml - r) * moss;
		g += (MOSS[1] * ml - g) * moss;
		b += (MOSS[2] * ml - b) * moss;
	}
	if (lichen > 0) {
		r += (LICHEN[0] * lightK - r) * lichen;
		g += (LICHEN[1] * lightK - g) * lichen;
		b += (LICHEN[2] * lightK - b) * lichen;
	}
	if (cap > 0) {
		const [sr, sg, sb] = f.shade;
		const cv = porch ? 0.55 : 1.02 * (1 - 0.3 * dark);
		r += (sr * cv - r) * cap;
		g += (sg * cv - g) * cap;
		b += (sb * cv - b) * cap;
	}
	if (valley > 0) {
		// Shingle valleys are woven or cut (a dark crease); tile and slate valleys are open metal,
		// dulled by weather.
		const metalV = MATERIALS[f.material] !== 'asphalt_shingle';
		const vr = metalV ? 0.36 * lightK : r * 0.55;
		const vg = metalV ? 0.37 * lightK : g * 0.55;
		const vb = metalV ? 0.36 * lightK : b * 0.55;
		r += (vr - r) * valley;
		g += (vg - g) * valley;
		b += (vb - b) * valley;
	}
	if (rake > 0) {
		r *= 1 - 0.15 * rake;
		g *= 1 - 0.15 * rake;
		b *= 1 - 0.15 * rake;
	}
	if (gutter > 0) {
		r += (0.86 - r) * gutter;
		g += (0.86 - g) * gutter;
		b += (0.83 - b) * gutter;
	} else if (drip > 0) {
		r *= 1 - 0.35 * drip;
		g *= 1 - 0.35 * drip;
		b *= 1 - 0.35 * drip;
	}
	setC(r, g, b);
}

// ---------------------------------------------------------------------------------------------
// Tiles, encoding, stamp, TileJSON

/** @type {import('@napi-rs/canvas').Canvas | undefined} */
let CANVAS;

/** @param {{ width: number, height: number, data: Uint8ClampedArray }} img @param {'webp' | 'png'} [format] */
export function encodeTile(img, format = 'webp') {
	if (!CANVAS || CANVAS.width !== img.width || CANVAS.height !== img.height)
		CANVAS = createCanvas(img.width, img.height);
	const canvas = CANVAS;
	const ctx = canvas.getContext('2d');
	ctx.putImageData(new ImageData(img.data, img.width, img.height), 0, 0);
	return format === 'png' ? canvas.encodeSync('png') : canvas.encodeSync('webp', WEBP_QUALITY);
}

/** Standard slippy-map tile numbers of a point. @param {number} lon @param {number} lat @param {number} z */
export function tileOf(lon, lat, z) {
	const [mx, my] = merc(lon, lat);
	return { x: Math.floor(mx * 2 ** z), y: Math.floor(my * 2 ** z) };
}

/** Every tile from MIN_ZOOM to MAX_ZOOM over the scene bounds plus margin. @param {Prepared} S */
export function tileList(S = sceneForDefault()) {
	const [w, s, e, n] = S.bounds;
	/** @type {{ z: number, x: number, y: number }[]} */
	const out = [];
	for (let z = MIN_ZOOM; z <= MAX_ZOOM; z++) {
		const a = tileOf(w, n, z);
		const b = tileOf(e, s, z);
		for (let x = a.x; x <= b.x; x++) for (let y = a.y; y <= b.y; y++) out.push({ z, x, y });
	}
	return out;
}

/** TileJSON 3.0.0 for the generated set. @param {Prepared} [S] */
export function tileJson(S = sceneForDefault()) {
	const [w, s, e, n] = S.bounds;
	const r = (/** @type {number} */ v) => Math.round(v * 1e7) / 1e7;
	return {
		tilejson: '3.0.0',
		name: 'Wrenfield sample imagery',
		description: 'Synthetic aerial imagery of an invented neighbourhood, drawn by Clearpitch.',
		version: GENERATOR_VERSION,
		attribution: 'Synthetic imagery © Clearpitch',
		scheme: 'xyz',
		tiles: ['/tiles/{z}/{x}/{y}.webp'],
		minzoom: MIN_ZOOM,
		maxzoom: MAX_ZOOM,
		bounds: [w, s, e, n].map(r),
		center: [r((w + e) / 2), r((s + n) / 2), 19]
	};
}

/** What the stamp file records: a rebuild happens when any of it changes. */
export function stampOf() {
	const sha = (/** @type {string} */ p) =>
		createHash('sha256').update(readFileSync(p)).digest('hex');
	return {
		generatorVersion: GENERATOR_VERSION,
		generatorHash: sha(fileURLToPath(import.meta.url)),
		sceneHash: sha(SCENE_FILE)
	};
}

/** @param {{ z: number, x: number, y: number }[]} tiles @param {string} dir */
function renderAll(tiles, dir) {
	for (const { z, x, y } of tiles) {
		const d = path.join(dir, String(z), String(x));
		mkdirSync(d, { recursive: true });
		writeFileSync(path.join(d, `${y}.webp`), encodeTile(renderTile(z, x, y)));
	}
}

/**
 * The stamp in `dir` if it matches this scene and this generator (and tiles.json is there),
 * else null. @param {string} dir @returns {{ tiles: number } | null}
 */
export function currentStamp(dir = TILES_DIR) {
	const file = path.join(dir, '.stamp.json');
	if (!existsSync(file) || !existsSync(path.join(dir, 'tiles.json'))) return null;
	try {
		const old = JSON.parse(readFileSync(file, 'utf8'));
		const now = stampOf();
		const same =
			old.generatorVersion === now.generatorVersion &&
			old.generatorHash === now.generatorHash &&
			old.sceneHash === now.sceneHash;
		return same && Number.isInteger(old.tiles) ? old : null;
	} catch {
		return null;
	}
}

/**
 * Writes every tile and tiles.json unless the stamp says they are current.
 * @param {{ force?: boolean, dir?: string, threads?: number, log?: (s: string) => void }} [opts]
 */
export async function generateTiles(opts = {}) {
	const dir = opts.dir ?? TILES_DIR;
	const log = opts.log ?? console.log;
	const stamp = stampOf();
	const stampFile = path.join(dir, '.stamp.json');
	if (!opts.force) {
		const current = currentStamp(dir);
		if (current) {
			log(
				`tiles up to date (${current.tiles} tiles in ${path.relative(process.cwd(), dir) || dir}); --force rebuilds`
			);
			return { skipped: true, tiles: current.tiles, seconds: 0 };
		}
	}
	const t0 = performance.now();
	const S = sceneForDefault();
	const tiles = tileList(S);
	// Old tiles could lie outside new bounds; the folder holds nothing but generated files.
	rmSync(dir, { recursive: true, force: true });
	mkdirSync(dir, { recursive: true });
	const threads = Math.max(1, Math.min(opts.threads ?? availableParallelism(), 8));
	if (threads === 1) renderAll(tiles, dir);
	else
		await Promise.all(
			Array.from({ length: threads }, (_, k) => {
				const part = tiles.filter((_t, i) => i % threads === k);
				return new Promise((resolve, reject) => {
					const w = new Worker(fileURLToPath(import.meta.url), {
						workerData: { tiles: part, dir }
					});
					w.once('message', resolve);
					w.once('error', reject);
					w.once(
						'exit',
						(code) => code !== 0 && reject(new Error(`tile worker exited with ${code}`))
					);
				});
			})
		);
	writeFileSync(path.join(dir, 'tiles.json'), JSON.stringify(tileJson(S), null, '\t') + '\n');
	writeFileSync(stampFile, JSON.stringify({ ...stamp, tiles: tiles.length }, null, '\t') + '\n');
	const seconds = (performance.now() - t0) / 1000;
	const perZoom = tiles.reduce((m, t) => m.set(t.z, (m.get(t.z) ?? 0) + 1), new Map());
	log(
		`wrote ${tiles.length} tiles (${[...perZoom].map(([z, n]) => `z${z}: ${n}`).join(', ')}) in ${seconds.toFixed(1)} s on ${threads} thread${threads > 1 ? 's' : ''}`
	);
	return { skipped: false, tiles: tiles.length, seconds };
}

if (!isMainThread && workerData?.tiles) {
	renderAll(workerData.tiles, workerData.dir);
	parentPort?.postMessage('done');
} else if (
	isMainThread &&
	process.argv[1] &&
	import.meta.url === pathToFileURL(process.argv[1]).href
) {
	generateTiles({ force: process.argv.includes('--force') }).catch((e) => {
		console.error(e);
		process.exit(1);
	});
}
