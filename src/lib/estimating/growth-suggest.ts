import { GROWTH_GRADES, type GrowthGrade } from './types';
import { TILE_SIZE, type TilePixels } from './tile-pixels';

/**
 * A growth grade suggested from the imagery under one facet. Algae shows from above as dark
 * streaks running down the slope, so the measures compare each patch of the facet with the
 * facet's own clean level: a roof's colour and its lighting differ from facet to facet, the
 * streaks do not. Pure: the editor runs it on canvas pixels, the tests on decoded tiles.
 */

/** A facet's pixels laid out on their own small grid, luminance 0–255. */
export interface FacetRaster {
	width: number;
	height: number;
	lum: Float32Array;
	inside: Uint8Array;
	count: number;
}

/** Relative luminance weights of ITU-R BT.709 (the sRGB primaries). */
const luminance = (r: number, g: number, b: number) => 0.2126 * r + 0.7152 * g + 0.0722 * b;

/** The chosen pixels of decoded RGBA tiles, on one grid; a tile that could not be read adds none. */
export function rasterFromTiles(
	tiles: readonly TilePixels[],
	rgbaOf: (t: TilePixels) => Uint8ClampedArray | Uint8Array | undefined
): FacetRaster {
	let x0 = Infinity;
	let y0 = Infinity;
	let x1 = -Infinity;
	let y1 = -Infinity;
	for (const t of tiles) {
		for (const i of t.pixels) {
			const wx = t.x * TILE_SIZE + (i % TILE_SIZE);
			const wy = t.y * TILE_SIZE + Math.floor(i / TILE_SIZE);
			x0 = Math.min(x0, wx);
			y0 = Math.min(y0, wy);
			x1 = Math.max(x1, wx);
			y1 = Math.max(y1, wy);
		}
	}
	if (!Number.isFinite(x0)) {
		return { width: 0, height: 0, lum: new Float32Array(0), inside: new Uint8Array(0), count: 0 };
	}
	const width = x1 - x0 + 1;
	const height = y1 - y0 + 1;
	const lum = new Float32Array(width * height);
	const inside = new Uint8Array(width * height);
	let count = 0;
	for (const t of tiles) {
		const rgba = rgbaOf(t);
		if (!rgba) continue;
		for (const i of t.pixels) {
			const k =
				(t.y * TILE_SIZE + Math.floor(i / TILE_SIZE) - y0) * width +
				(t.x * TILE_SIZE + (i % TILE_SIZE) - x0);
			lum[k] = luminance(rgba[i * 4], rgba[i * 4 + 1], rgba[i * 4 + 2]);
			inside[k] = 1;
			count++;
		}
	}
	return { width, height, lum, inside, count };
}

export interface MeasureOptions {
	/**
	 * Box-blur radius in pixels before comparing: it averages out the regular texture of tile
	 * courses, shingle tabs and seams (tens of centimetres) and keeps the streaks, which run on
	 * for metres. 2 px each side is a box of about 0.3 m at zoom 21.
	 */
	blurPx: number;
	/** Quantile of the blurred luminance taken as the facet's clean level (robust to a few glints). */
	cleanQuantile: number;
	/** A patch darker than clean by more than this share counts as a streak. */
	streakMargin: number;
	/** … and by more than this share as heavy growth. */
	heavyMargin: number;
}

export const DEFAULT_MEASURE_OPTIONS: MeasureOptions = {
	blurPx: 2,
	cleanQuantile: 0.75,
	streakMargin: 0.1,
	heavyMargin: 0.2
};

export interface GrowthMeasures {
	pixels: number;
	/** Luminance 0–255 of the facet's clean surface. */
	cleanLevel: number;
	/** Share of the facet darker than clean by more than the streak margin, 0–1. */
	streakShare: number;
	/** Share darker than clean by more than the heavy margin, 0–1. */
	heavyShare: number;
	/** Mean shortfall beyond the streak margin, as a share of the clean level, 0–1. */
	contrast: number;
	/** One number the thresholds cut into grades: more streaks, darker streaks, higher. */
	score: number;
}

/** The minimum a facet must show to be graded at all: about 0.2 m² at zoom 21. */
export const MIN_PIXELS = 50;

/** Streak, heavy and contrast combined; weights chosen so each grade step moves it about evenly. */
export const growthScore = (m: Pick<GrowthMeasures, 'streakShare' | 'heavyShare' | 'contrast'>) =>
	m.streakShare + 2 * m.heavyShare + 4 * m.contrast;

export function growthMeasures(
	raster: FacetRaster,
	options: Partial<MeasureOptions> = {}
): GrowthMeasures | undefined {
	const o = { ...DEFAULT_MEASURE_OPTIONS, ...options };
	const { width: w, height: h, lum, inside } = raster;
	if (raster.count < MIN_PIXELS) return undefined;
	// Summed-area tables of luminance and of the mask: an O(1) box mean that ignores outside pixels.
	const W = w + 1;
	const sum = new Float64Array(W * (h + 1));
	const cnt = new Float64Array(W * (h + 1));
	for (let y = 0; y < h; y++) {
		let rs = 0;
		let rc = 0;
		for (let x = 0; x < w; x++) {
			const k = y * w + x;
			if (inside[k]) {
				rs += lum[k];
				rc++;
			}
			sum[(y + 1) * W + x + 1] = sum[y * W + x + 1] + rs;
			cnt[(y + 1) * W + x + 1] = cnt[y * W + x + 1] + rc;
		}
	}
	const r = Math.max(0, Math.round(o.blurPx));
	const box = (a: Float64Array, xa: number, ya: number, xb: number, yb: number) =>
		a[yb * W + xb] - a[ya * W + xb] - a[yb * W + xa] + a[ya * W + xa];
	const blurred = new Float64Array(raster.count);
	let n = 0;
	for (let y = 0; y < h; y++) {
		for (let x = 0; x < w; x++) {
			if (!inside[y * w + x]) continue;
			const xa = Math.max(0, x - r);
			const xb = Math.min(w, x + r + 1);
			const ya = Math.max(0, y - r);
			const yb = Math.min(h, y + r + 1);
			blurred[n++] = box(sum, xa, ya, xb, yb) / box(cnt, xa, ya, xb, yb);
		}
	}
	const sorted = Float64Array.from(blurred.subarray(0, n)).sort();
	const clean = sorted[Math.min(n - 1, Math.floor(o.cleanQuantile * n))];
	if (!(clean > 0)) {
		return { pixels: n, cleanLevel: 0, streakShare: 0, heavyShare: 0, contrast: 0, score: 0 };
	}
	let streak = 0;
	let heavy = 0;
	let deficit = 0;
	for (let i = 0; i < n; i++) {
		const d = (clean - blurred[i]) / clean;
		if (d > o.streakMargin) streak++;
		if (d > o.heavyMargin) heavy++;
		if (d > o.streakMargin) deficit += d - o.streakMargin;
	}
	const m = { streakShare: streak / n, heavyShare: heavy / n, contrast: deficit / n };
	return { pixels: n, cleanLevel: clean, ...m, score: growthScore(m) };
}

/** Four rising cuts on the score: below cuts[0] is G0, at or above cuts[3] is G4. */
export interface GrowthThresholds {
	cuts: [number, number, number, number];
}

/**
 * Fitted by `calibrate` on the sample scene's 40 facets (synthetic imagery, see README): a
 * starting point only. Real imagery differs in colour, blur and sun; the owner calibrates from
 * facets graded on site.
 */
export const DEFAULT_GROWTH_THRESHOLDS: GrowthThresholds = { cuts: [0.003, 0.026, 0.56, 1.57] };

export interface GrowthSuggestion {
	grade: GrowthGrade;
	/** 0.5 on a cut, towards 1 deep inside a grade's band. */
	confidence: number;
}

export function suggestGrade(
	measures: Pick<GrowthMeasures, 'score'>,
	thresholds: GrowthThresholds = DEFAULT_GROWTH_THRESHOLDS
): GrowthSuggestion {
	const { cuts } = thresholds;
	const s = measures.score;
	let g = 0;
	while (g < 4 && s >= cuts[g]) g++;
	// How far inside its band the score sits, against the typical band width.
	const gaps = cuts
		.slice(1)
		.map((c, i) => c - cuts[i])
		.filter((d) => d > 0);
	const typical = gaps.length ? gaps.reduce((a, b) => a + b, 0) / gaps.length : 1;
	const nearest = Math.min(...cuts.map((c) => Math.abs(s - c)));
	const confidence = Math.min(0.99, 0.5 + 0.5 * Math.min(1, nearest / (typical / 2)));
	return { grade: GROWTH_GRADES[g], confidence: Math.round(confidence * 100) / 100 };
}

export interface CalibrationSample {
	score: number;
	grade: GrowthGrade;
}

export interface Calibration {
	thresholds: GrowthThresholds;
	/** Σ |suggested − true| in grade steps over the samples, before and after. */
	errorBefore: number;
	errorAfter: number;
	exactBefore: number;
	exactAfter: number;
	samples: number;
}

const gradeIndex = (g: GrowthGrade) => GROWTH_GRADES.indexOf(g);

export function agreement(
	samples: readonly CalibrationSample[],
	t: GrowthThresholds
): { error: number; exact: number; withinOne: number } {
	let error = 0;
	let exact = 0;
	let withinOne = 0;
	for (const s of samples) {
		const d = Math.abs(gradeIndex(suggestGrade(s, t).grade) - gradeIndex(s.grade));
		error += d;
		if (d === 0) exact++;
		if (d <= 1) withinOne++;
	}
	return { error, exact, withinOne };
}

/**
 * Fits the four cuts to (score, true grade) pairs by an ordinal cut search: with the samples in
 * score order, grades that never fall as the score rises are chosen to minimise the total
 * grade error Σ |suggested − true| (dynamic programming, exact), ties going to more exact
 * matches; each cut then sits midway between the last sample of one grade and the first of the
 * next. A grade no sample reaches keeps the current cut, pushed into order.
 */
export function calibrate(
	samples: readonly CalibrationSample[],
	current: GrowthThresholds = DEFAULT_GROWTH_THRESHOLDS
): Calibration {
	const sorted = [...samples].sort((a, b) => a.score - b.score);
	const n = sorted.length;
	const G = GROWTH_GRADES.length;
	// cost[i][g]: best (error, −exact) for samples 0..i with sample i given grade g.
	const cost: Array<Array<[number, number]>> = [];
	const from: number[][] = [];
	for (let i = 0; i < n; i++) {
		cost.push([]);
		from.push([]);
		const t = gradeIndex(sorted[i].grade);
		for (let g = 0; g < G; g++) {
			const own: [number, number] = [Math.abs(g - t), g === t ? -1 : 0];
			if (i === 0) {
				cost[i][g] = own;
				from[i][g] = -1;
				continue;
			}
			let best: [number, number] = [Infinity, 0];
			let arg = 0;
			for (let p = 0; p <= g; p++) {
				const c = cost[i - 1][p];
				if (c[0] < best[0] || (c[0] === best[0] && c[1] < best[1])) {
					best = c;
					arg = p;
				}
			}
			cost[i][g] = [best[0] + own[0], best[1] + own[1]];
			from[i][g] = arg;
		}
	}
	const assigned = new Array<number>(n);
	if (n > 0) {
		let g = 0;
		for (let k = 1; k < G; k++) {
			const a = cost[n - 1][k];
			const b = cost[n - 1][g];
			if (a[0] < b[0] || (a[0] === b[0] && a[1] < b[1])) g = k;
		}
		for (let i = n - 1; i >= 0; i--) {
			assigned[i] = g;
			g = from[i][g];
		}
	}
	const cuts = [...current.cuts] as GrowthThresholds['cuts'];
	for (let k = 1; k < G; k++) {
		const lastBelow = assigned.findLastIndex((a) => a < k);
		const firstAt = assigned.findIndex((a) => a >= k);
		if (lastBelow >= 0 && firstAt >= 0 && firstAt === lastBelow + 1) {
			cuts[k - 1] = (sorted[lastBelow].score + sorted[firstAt].score) / 2;
		}
	}
	for (let k = 1; k < cuts.length; k++) cuts[k] = Math.max(cuts[k], cuts[k - 1]);
	const thresholds = { cuts };
	const before = agreement(samples, current);
	const after = agreement(samples, thresholds);
	return {
		thresholds,
		errorBefore: before.error,
		errorAfter: after.error,
		exactBefore: before.exact,
		exactAfter: after.exact,
		samples: n
	};
}
