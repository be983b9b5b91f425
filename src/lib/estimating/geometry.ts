import { area, earthRadius, kinks } from '@turf/turf';
import type { Polygon, Position } from 'geojson';
import type { EdgeKind } from './types';
import { M_PER_FT, m2ToFt2, mToFt } from './units';

/** WGS84 ellipsoid (NIMA TR8350.2). */
export const WGS84_A = 6378137;
export const WGS84_F = 1 / 298.257223563;
const E2 = WGS84_F * (2 - WGS84_F);
const DEG = Math.PI / 180;
const HALF_DEG = DEG / 2;

/** A facet outline smaller than this is a slip of the mouse, not a roof plane. */
export const MIN_FACET_AREA_FT2 = 1;
/** No roof facet has an edge this long; longer usually means swapped [lat, lon]. */
export const MAX_EDGE_M = 1000;

/** Meridional radius of curvature M at a latitude (m). */
export function meridionalRadius(latDeg: number): number {
	const s = Math.sin(latDeg * DEG);
	const w = 1 - E2 * s * s;
	return (WGS84_A * (1 - E2)) / (w * Math.sqrt(w));
}

/** Prime-vertical radius of curvature N at a latitude (m). */
export function primeVerticalRadius(latDeg: number): number {
	const s = Math.sin(latDeg * DEG);
	return WGS84_A / Math.sqrt(1 - E2 * s * s);
}

/**
 * Turf's area is on a sphere of radius R = 6,371,008.8 m, so a small polygon comes out scaled
 * by R²/(M·N) at its latitude (+0.45% at the equator, −0.56% at 60°; docs/estimating-model.md
 * §1).
 * Multiplying by M·N/R² puts it on the WGS84 ellipsoid.
 */
export function ellipsoidAreaCorrection(latDeg: number): number {
	return (meridionalRadius(latDeg) * primeVerticalRadius(latDeg)) / (earthRadius * earthRadius);
}

export interface GeometryIssue {
	/** Path below the facet, e.g. ['geometry', 'coordinates', 0, 3]. */
	path: Array<string | number>;
	code: string;
	message: string;
}

export interface FacetPlan {
	planAreaM2: number;
	planAreaFt2: number;
	perimeterFt: number;
	/** Plan length of ring segment i (position i → i+1), ft. */
	segmentLengthsFt: number[];
	centroidLatDeg: number;
}

export type PlanResult = { ok: true; plan: FacetPlan } | { ok: false; issues: GeometryIssue[] };

const fail = (path: GeometryIssue['path'], code: string, message: string): PlanResult => ({
	ok: false,
	issues: [{ path, code, message }]
});

const isFiniteNumber = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

/**
 * Checks a facet outline and measures it. Everything the request schema checks is checked again
 * here, because the model is also called from scripts and tests without the schema.
 */
export function measureFacetPlan(polygon: Polygon): PlanResult {
	if (!polygon || polygon.type !== 'Polygon' || !Array.isArray(polygon.coordinates)) {
		return fail(['geometry'], 'not_polygon', 'geometry must be a GeoJSON Polygon');
	}
	const rings = polygon.coordinates;
	if (rings.length !== 1) {
		return fail(
			['geometry', 'coordinates'],
			rings.length === 0 ? 'no_ring' : 'holes_unsupported',
			rings.length === 0
				? 'the outline has no ring'
				: 'geometry must have exactly one ring (holes are not supported: outline the facet)'
		);
	}
	const ring = rings[0];
	if (!Array.isArray(ring) || ring.length < 4) {
		return fail(
			['geometry', 'coordinates', 0],
			'too_few_positions',
			'the outline needs at least 3 corners (4 positions, the last repeating the first)'
		);
	}
	const n = ring.length;
	let minLon = Infinity;
	let maxLon = -Infinity;
	let latSum = 0;
	let repeats = false;
	for (let i = 0; i < n; i++) {
		const p = ring[i];
		if (!Array.isArray(p) || p.length < 2 || !isFiniteNumber(p[0]) || !isFiniteNumber(p[1])) {
			return fail(
				['geometry', 'coordinates', 0, i],
				'bad_position',
				`position ${i} must be [lon, lat] with finite numbers`
			);
		}
		const x = p[0];
		const y = p[1];
		if (x < -180 || x > 180 || y < -90 || y > 90) {
			return fail(
				['geometry', 'coordinates', 0, i],
				'out_of_range',
				`position ${i} is out of range (lon −180..180, lat −90..90; GeoJSON order is [lon, lat])`
			);
		}
		if (x < minLon) minLon = x;
		if (x > maxLon) maxLon = x;
		if (i < n - 1) latSum += y;
		if (i > 0 && x === ring[i - 1][0] && y === ring[i - 1][1]) repeats = true;
	}
	if (ring[0][0] !== ring[n - 1][0] || ring[0][1] !== ring[n - 1][1]) {
		return fail(
			['geometry', 'coordinates', 0],
			'ring_not_closed',
			'the outline is not closed: the last position must repeat the first'
		);
	}
	// Any interior latitude serves for the radii: they change by parts per billion across a roof.
	const centroidLatDeg = latSum / (n - 1);

	// Only a facet astride ±180° (longitudes unwrapped against the first corner) or one with
	// repeated consecutive positions (harmless for area, but turf's kinks reports the shared
	// point as a crossing) needs a working copy of its ring.
	const wraps = maxLon - minLon > 180;
	let work: Position[] = ring;
	if (wraps || repeats) {
		const lon0 = ring[0][0];
		work = [];
		for (let i = 0; i < n; i++) {
			let x = ring[i][0];
			if (wraps) {
				const d = x - lon0;
				x = d > 180 ? x - 360 : d < -180 ? x + 360 : x;
			}
			const y = ring[i][1];
			const prev = work[work.length - 1];
			if (!prev || x !== prev[0] || y !== prev[1]) work.push([x, y]);
		}
	}

	// Most facets are convex (rectangles, trapezoids, triangles). A strictly convex ring has three
	// distinct corners, cannot double back and cannot cross itself, so those checks (turf's kinks
	// is O(n²)) run only on the others.
	const convex = isStrictlyConvex(work);
	if (!convex && !distinctAtLeast3(ring)) {
		return fail(
			['geometry', 'coordinates', 0],
			'too_few_vertices',
			'the outline needs at least 3 distinct corners'
		);
	}

	// Plan lengths in a local plane from the ellipsoid's radii: x = N·cosφ·Δλ, y = M·Δφ
	// (agrees with GeographicLib to well under 1 ppm over a roof; docs/estimating-model.md §1).
	// M and N barely change across a roof, but cosφ does (by ~5 ppm over 12 m at 70°), so it is
	// taken per edge.
	const phiC = centroidLatDeg * DEG;
	const sinC = Math.sin(phiC);
	const cosC = Math.cos(phiC);
	const w = 1 - E2 * sinC * sinC;
	const sqrtW = Math.sqrt(w);
	const nC = WGS84_A / sqrtW;
	const mC = (WGS84_A * (1 - E2)) / (w * sqrtW);
	const kx = nC * DEG;
	const ky = mC * DEG;
	const segmentLengthsFt = new Array<number>(n - 1);
	let perimeterM = 0;
	for (let i = 0; i < n - 1; i++) {
		let dl = ring[i + 1][0] - ring[i][0];
		if (wraps) dl = dl > 180 ? dl - 360 : dl < -180 ? dl + 360 : dl;
		// cos of the edge's mid-latitude by Taylor series about the centroid (|δ| < 1e-4 rad,
		// so the cubic term is below 1e-12)
		const d = (ring[i][1] + ring[i + 1][1]) * HALF_DEG - phiC;
		const dx = kx * (cosC * (1 - 0.5 * d * d) - sinC * d) * dl;
		const dy = ky * (ring[i + 1][1] - ring[i][1]);
		const len = Math.sqrt(dx * dx + dy * dy);
		if (len > MAX_EDGE_M) {
			return fail(
				['geometry', 'coordinates', 0, i + 1],
				'too_large',
				`edge ${i} is ${Math.round(len)} m long, too long for a roof facet (check the [lon, lat] order)`
			);
		}
		segmentLengthsFt[i] = len / M_PER_FT;
		perimeterM += len;
	}

	const back = convex ? -1 : findDoubleBack(work, centroidLatDeg);
	if (back >= 0) {
		return fail(
			['geometry', 'coordinates', 0],
			'self_overlap',
			`the outline doubles back on itself at corner [${fmtPos(work[back])}]`
		);
	}
	const geometry: Polygon = work === ring ? polygon : { type: 'Polygon', coordinates: [work] };
	const crossings = convex ? null : kinks(geometry);
	if (crossings && crossings.features.length > 0) {
		const at = crossings.features[0].geometry.coordinates;
		return fail(
			['geometry'],
			'self_intersection',
			`the outline crosses itself near [${fmtPos(at)}]; redraw the facet without crossing edges`
		);
	}

	// Same correction as ellipsoidAreaCorrection(), from the radii already at hand.
	const planAreaM2 = (area(geometry) * mC * nC) / (earthRadius * earthRadius);
	const planAreaFt2 = m2ToFt2(planAreaM2);
	if (!(planAreaFt2 >= MIN_FACET_AREA_FT2)) {
		return fail(
			['geometry'],
			'zero_area',
			`the outline has zero or negligible area (${planAreaFt2.toFixed(3)} ft², under ${MIN_FACET_AREA_FT2} ft²)`
		);
	}
	return {
		ok: true,
		plan: {
			planAreaM2,
			planAreaFt2,
			perimeterFt: mToFt(perimeterM),
			segmentLengthsFt,
			centroidLatDeg
		}
	};
}

/** Needs three different corners; A,B,A,B… or A,B,B,A has only two. */
function distinctAtLeast3(ring: Position[]): boolean {
	const a = ring[0];
	let b: Position | undefined;
	for (let i = 1; i < ring.length - 1; i++) {
		const p = ring[i];
		if (p[0] === a[0] && p[1] === a[1]) continue;
		if (!b) b = p;
		else if (p[0] !== b[0] || p[1] !== b[1]) return true;
	}
	return false;
}

/**
 * True when a closed ring without repeated consecutive positions turns the same way at every
 * corner and winds round only once (x changes direction exactly twice; a pentagram turns one
 * way everywhere but winds twice). Such a ring is simple. Collinear corners make it false,
 * which only means the full check runs.
 */
export function isStrictlyConvex(ring: Position[]): boolean {
	const m = ring.length - 1;
	if (m < 3) return false;
	let sign = 0;
	let flips = 0;
	let prevDx = ring[0][0] - ring[m - 1][0];
	let prevDy = ring[0][1] - ring[m - 1][1];
	let lastXDir = Math.sign(prevDx);
	for (let j = 0; j < m; j++) {
		const dx = ring[j + 1][0] - ring[j][0];
		const dy = ring[j + 1][1] - ring[j][1];
		const cross = prevDx * dy - prevDy * dx;
		if (cross === 0) return false;
		const s = cross > 0 ? 1 : -1;
		if (sign === 0) sign = s;
		else if (s !== sign) return false;
		const xDir = Math.sign(dx);
		if (xDir !== 0) {
			if (lastXDir !== 0 && xDir !== lastXDir) flips++;
			lastXDir = xDir;
		}
		prevDx = dx;
		prevDy = dy;
	}
	return flips <= 2;
}

/**
 * A spike (A→B→A') adds no area and turf's kinks skips adjacent segments, so it is found here:
 * two consecutive segments pointing in opposite directions along one line.
 */
function findDoubleBack(clean: Position[], latDeg: number): number {
	const kx = Math.cos(latDeg * DEG);
	const m = clean.length - 1;
	for (let j = 0; j < m; j++) {
		const p0 = clean[j === 0 ? m - 1 : j - 1];
		const p1 = clean[j];
		const p2 = clean[j + 1];
		const ax = (p1[0] - p0[0]) * kx;
		const ay = p1[1] - p0[1];
		const bx = (p2[0] - p1[0]) * kx;
		const by = p2[1] - p1[1];
		const cross = ax * by - ay * bx;
		const dot = ax * bx + ay * by;
		if (dot < 0 && Math.abs(cross) <= 1e-9 * Math.sqrt((ax * ax + ay * ay) * (bx * bx + by * by))) {
			return j;
		}
	}
	return -1;
}

const fmtPos = (p: Position): string => `${p[0].toFixed(7)}, ${p[1].toFixed(7)}`;

export interface EaveResult {
	eaveLengthFt: number;
	estimated: boolean;
}

/**
 * Eave length from the edge labels. An eave is its true plan length (docs/estimating-model.md
 * §2). Without labels the longest unlabelled segment stands in for it: the eave is the longest
 * edge of a gable rectangle, a hip triangle and a hip trapezoid alike. A fully labelled facet with no
 * eave (one draining onto another facet) has none.
 */
export function eaveLength(
	segmentLengthsFt: readonly number[],
	edges: ReadonlyArray<EdgeKind | null> | undefined
): EaveResult {
	let eave = 0;
	let anyEave = false;
	let longestUnlabelled = 0;
	let anyUnlabelled = false;
	for (let i = 0; i < segmentLengthsFt.length; i++) {
		const kind = edges ? edges[i] : null;
		const len = segmentLengthsFt[i];
		if (kind === 'eave') {
			eave += len;
			anyEave = true;
		} else if (kind == null) {
			anyUnlabelled = true;
			if (len > longestUnlabelled) longestUnlabelled = len;
		}
	}
	if (anyEave || !anyUnlabelled) return { eaveLengthFt: eave, estimated: false };
	return { eaveLengthFt: longestUnlabelled, estimated: true };
}
