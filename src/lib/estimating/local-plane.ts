import type { Position } from 'geojson';
import { meridionalRadius, primeVerticalRadius } from './geometry';

const DEG = Math.PI / 180;

/**
 * The ellipsoidal local plane about one point, x = N·cosφ0·Δλ, y = M·Δφ (WGS84 radii at the
 * point), in metres. Over a house it agrees with geodesic lengths and areas to well under 1 ppm
 * (docs/estimating-model.md §1), which is what lets roof geometry be done in plain metres.
 */
export interface LocalPlane {
	toXY(p: Position): [number, number];
	toLonLat(xy: readonly [number, number]): [number, number];
}

export function localPlane(lon0: number, lat0: number): LocalPlane {
	const kx = primeVerticalRadius(lat0) * Math.cos(lat0 * DEG) * DEG;
	const ky = meridionalRadius(lat0) * DEG;
	return {
		toXY: (p) => [(p[0] - lon0) * kx, (p[1] - lat0) * ky],
		toLonLat: ([x, y]) => [lon0 + x / kx, lat0 + y / ky]
	};
}

/** A plane about the mean corner of a closed ring (its last position repeats the first). */
export function planeForRing(ring: readonly Position[]): LocalPlane {
	const n = Math.max(1, ring.length - 1);
	let lon = 0;
	let lat = 0;
	for (let i = 0; i < n; i++) {
		lon += ring[i][0];
		lat += ring[i][1];
	}
	return localPlane(lon / n, lat / n);
}
