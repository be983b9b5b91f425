import { area, earthRadius, kinks } from '@turf/turf';
import type { Polygon, Position } from 'geojson';
import type { EdgeKind } from './types';
import { m2ToFt2, mToFt } from './units';

/** WGS84 ellipsoid (NIMA TR8350.2). */
export const WGS84_A = 6378137;
export const WGS84_F = 1 / 298.257223563;
const E2 = WGS84_F * (2 - WGS84_F);
const DEG = Math.PI / 180;

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
 * by R²/(M·N) at its latitude (+0.45% at the equator, −0.56% at 60°; DOMAIN.md §4).
 * Multiplying by M·N/R² puts it on the WGS84 ellipsoid.
 */
export function ellipsoidAreaCorrection(latDeg: number): number {
	return (meridionalRadius(latDeg) * primeVerticalRadius(latDeg)) / (earthRadius * earthRadius);
}

export interface GeometryIssue {
	/** Path below the facet, e.g. ['polygon', 'coordinates', 0, 3]. */
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
		return fail(['polygon'], 'not_polygon', 'polygon must be a GeoJSON Polygon');
	}
	const rings = polygon.coordinates;
	if (rings.length !== 1) {
		return fail(
			['polygon', 'coordinates'],
			rings.length === 0 ? 'no_ring' : 'holes_unsupported',
			rings.length === 0
				? 'polygon has no ring'
				: 'polygon must have exactly one ring (holes are not supported: outline the whole facet)'
		);
	}
	const ring = rings[0];
	if (!Array.isArray(ring) || ring.length < 4) {
		return fail(
			['polygon', 'coordinates', 0],
			'too_few_positions',
			'polygon ring needs at least 4 positions (3 corners and the closing position)'
		);
	}
	const n = ring.length;
	for (let i = 0; i < n; i++) {
		const p = ring[i];
		if (!Array.isArray(p) || p.length < 2 || !isFiniteNumber(p[0]) || !isFiniteNumber(p[1])) {
			return fail(
				['polygon', 'coordinates', 0, i],
				'bad_position',
				`position ${i} must be [lon, lat] with finite numbers`
			);
		}
		if (p[0] < -180 || p[0] > 180 || p[1] < -90 || p[1] > 90) {
			return fail(
				['polygon', 'coordinates', 0, i],
				'out_of_range',
				`position ${i} is out of range (lon −180..180, lat −90..90; GeoJSON order is [lon, lat])`
			);
		}
	}
	if (ring[0][0] !== ring[n - 1][0] || ring[0][1] !== ring[n - 1][1]) {
		return fail(
			['polygon', 'coordinates', 0],
			'ring_not_closed',
			'polygon ring is not closed: the last position must repeat the first'
		);
	}

	// Longitudes are unwrapped against the first corner so a facet astride ±180° stays whole.
	const lon0 = ring[0][0];
	const lons = new Array<number>(n);
	const lats = new Array<number>(n);
	for (let i = 0; i < n; i++) {
		let d = ring[i][0] - lon0;
		if (d > 180) d -= 360;
		else if (d < -180) d += 360;
		lons[i] = lon0 + d;
		lats[i] = ring[i][1];
	}

	// Distinct corners, and the ring without repeated consecutive positions (zero-length segments
	// are harmless for area, but turf's kinks would report the shared point as a crossing).
	const clean: Position[] = [[lons[0], lats[0]]];
	for (let i = 1; i < n; i++) {
		const prev = clean[clean.length - 1];
		if (lons[i] !== prev[0] || lats[i] !== prev[1]) clean.push([lons[i], lats[i]]);
	}
	const distinct = clean.length - 1;
	let latSum = 0;
	for (let i = 0; i < distinct; i++) latSum += clean[i][1];
	if (distinct < 3 || !distinctAtLeast3(clean)) {
		return fail(
			['polygon', 'coordinates', 0],
			'too_few_vertices',
			'polygon needs at least 3 distinct corners'
		);
	}
	const centroidLatDeg = latSum / distinct;

	// Plan lengths in a local plane from the ellipsoid's radii at each segment's mid-latitude:
	// x = N·cosφ·Δλ, y = M·Δφ (good to well under 1 ppm over a roof; DOMAIN.md §4).
	const segmentLengthsFt = new Array<number>(n - 1);
	let perimeterM = 0;
	for (let i = 0; i < n - 1; i++) {
		const midLat = (lats[i] + lats[i + 1]) / 2;
		const dx = primeVerticalRadius(midLat) * Math.cos(midLat * DEG) * (lons[i + 1] - lons[i]) * DEG;
		const dy = meridionalRadius(midLat) * (lats[i + 1] - lats[i]) * DEG;
		const len = Math.sqrt(dx * dx + dy * dy);
		if (len > MAX_EDGE_M) {
			return fail(
				['polygon', 'coordinates', 0, i + 1],
				'too_large',
				`edge ${i} is ${Math.round(len)} m long, too long for a roof facet (check the [lon, lat] order)`
			);
		}
		segmentLengthsFt[i] = mToFt(len);
		perimeterM += len;
	}

	const back = findDoubleBack(clean, centroidLatDeg);
	if (back >= 0) {
		return fail(
			['polygon', 'coordinates', 0],
			'self_overlap',
			`polygon outline doubles back on itself at corner [${fmtPos(clean[back])}]`
		);
	}
	const crossings = kinks({ type: 'Polygon', coordinates: [clean] });
	if (crossings.features.length > 0) {
		const at = crossings.features[0].geometry.coordinates;
		return fail(
			['polygon'],
			'self_intersection',
			`polygon outline crosses itself near [${fmtPos(at)}]; redraw the facet without crossing edges`
		);
	}

	const planAreaM2 =
		area({ type: 'Polygon', coordinates: [clean] }) * ellipsoidAreaCorrection(centroidLatDeg);
	const planAreaFt2 = m2ToFt2(planAreaM2);
	if (!(planAreaFt2 >= MIN_FACET_AREA_FT2)) {
		return fail(
			['polygon'],
			'zero_area',
			`polygon has zero or negligible area (${planAreaFt2.toFixed(3)} ft², under ${MIN_FACET_AREA_FT2} ft²)`
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

/** Consecutive-distinct is not enough: A,B,A,B… has only 2 distinct corners. */
function distinctAtLeast3(clean: Position[]): boolean {
	const a = clean[0];
	let b: Position | undefined;
	for (let i = 1; i < clean.length - 1; i++) {
		const p = clean[i];
		if (p[0] === a[0] && p[1] === a[1]) continue;
		if (!b) b = p;
		else if (p[0] !== b[0] || p[1] !== b[1]) return true;
	}
	return false;
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
 * Eave length from the edge labels. An eave is its true plan length (DOMAIN.md §3.1). Without
 * labels the longest unlabelled segment stands in for it: the eave is the longest edge of a
 * gable rectangle, a hip triangle and a hip trapezoid alike. A fully labelled facet with no
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
