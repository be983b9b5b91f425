import type { Position } from 'geojson';
import { planeForRing } from './local-plane';

/** Sides within this many degrees of the building's axes are squared to them. */
export const SQUARE_TOLERANCE_DEG = 12;

/**
 * Squares a traced outline: houses are mostly built at right angles, and a hand-placed corner
 * is not. The building's axis is the length-weighted mean direction of its sides (taken modulo
 * 90°, so every side votes); each side near an axis is turned onto it about its midpoint, and the
 * corners become the crossings of neighbouring side lines. Sides far from both axes (a bay, a
 * 45° corner) keep their own direction. Returns a closed ring with as many corners as it got.
 */
export function squareCorners(ring: Position[], toleranceDeg = SQUARE_TOLERANCE_DEG): Position[] {
	const m = ring.length - 1;
	if (m < 3) return ring.map((p) => [...p]);
	const plane = planeForRing(ring);
	const pts = ring.slice(0, m).map((p) => plane.toXY(p));

	// Mean of angles modulo 90°: average the unit vectors of 4θ, weighted by length.
	let sx = 0;
	let sy = 0;
	const sides = pts.map((p, i) => {
		const q = pts[(i + 1) % m];
		const dx = q[0] - p[0];
		const dy = q[1] - p[1];
		const len = Math.hypot(dx, dy);
		const theta = Math.atan2(dy, dx);
		sx += len * Math.cos(4 * theta);
		sy += len * Math.sin(4 * theta);
		return { mid: [(p[0] + q[0]) / 2, (p[1] + q[1]) / 2] as [number, number], theta, len };
	});
	if (Math.hypot(sx, sy) < 1e-9) return ring.map((p) => [...p]);
	const axis = Math.atan2(sy, sx) / 4;
	const tol = (toleranceDeg * Math.PI) / 180;

	const lines = sides.map((s) => {
		const k = Math.round((s.theta - axis) / (Math.PI / 2));
		const snapped = axis + (k * Math.PI) / 2;
		const dir = Math.abs(s.theta - snapped) <= tol && s.len > 0 ? snapped : s.theta;
		return { p: s.mid, d: [Math.cos(dir), Math.sin(dir)] as [number, number] };
	});

	const out: Position[] = [];
	for (let i = 0; i < m; i++) {
		const a = lines[(i - 1 + m) % m];
		const b = lines[i];
		const det = a.d[0] * b.d[1] - a.d[1] * b.d[0];
		let xy: [number, number];
		if (Math.abs(det) < 1e-9) {
			// Two sides on one line (a corner on a straight run): keep the corner on that line.
			const t = (pts[i][0] - b.p[0]) * b.d[0] + (pts[i][1] - b.p[1]) * b.d[1];
			xy = [b.p[0] + t * b.d[0], b.p[1] + t * b.d[1]];
		} else {
			const t = ((b.p[0] - a.p[0]) * b.d[1] - (b.p[1] - a.p[1]) * b.d[0]) / det;
			xy = [a.p[0] + t * a.d[0], a.p[1] + t * a.d[1]];
		}
		out.push(plane.toLonLat(xy));
	}
	out.push([...out[0]]);
	return out;
}
