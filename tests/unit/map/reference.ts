// Reference helpers for the map tests: GeographicLib (registry package geographiclib-geodesic
// 2.2.0, Karney 2013, J. Geodesy 87:43–55) for ellipsoidal areas, and the Web Mercator
// formulas of EPSG:3857 for screen pixels, both independent of the code under test.
import { createRequire } from 'node:module';
import type { Polygon } from 'geojson';

const require = createRequire(import.meta.url);
export const { Geodesic } =
	require('geographiclib-geodesic') as typeof import('geographiclib-geodesic');

/** Ellipsoidal area of a GeoJSON outer ring, m². */
export function geodesicAreaM2(polygon: Polygon): number {
	const p = Geodesic.WGS84.Polygon(false);
	const ring = polygon.coordinates[0];
	for (let i = 0; i < ring.length - 1; i++) p.AddPoint(ring[i][1], ring[i][0]);
	return Math.abs(p.Compute(false, true).area!);
}

/**
 * A w × h metre rectangle whose corners are placed with GeographicLib's direct problem
 * (east then north from the south-west corner), so its true area is w·h to well under 1 ppm.
 */
export function rectangleM(lat: number, lon: number, w: number, h: number): Polygon {
	const g = Geodesic.WGS84;
	const se = g.Direct(lat, lon, 90, w);
	const nw = g.Direct(lat, lon, 0, h);
	const ne = g.Direct(nw.lat2!, nw.lon2!, 90, w);
	const ring: [number, number][] = [
		[lon, lat],
		[se.lon2!, se.lat2!],
		[ne.lon2!, ne.lat2!],
		[nw.lon2!, nw.lat2!],
		[lon, lat]
	];
	return { type: 'Polygon', coordinates: [ring] };
}

/** EPSG:3857 pixels at a zoom (512-px world at zoom 0, as MapLibre counts it). */
export function mercatorProject(zoom: number, origin: [number, number] = [0, 0]) {
	const size = 512 * 2 ** zoom;
	const px = ([lon, lat]: [number, number]) => {
		const x = ((lon + 180) / 360) * size;
		const s = Math.sin((lat * Math.PI) / 180);
		const y = (0.5 - Math.log((1 + s) / (1 - s)) / (4 * Math.PI)) * size;
		return { x, y };
	};
	const o = px(origin);
	return (p: [number, number]) => {
		const q = px(p);
		return { x: q.x - o.x, y: q.y - o.y };
	};
}

export const FT2_PER_M2 = 1 / 0.09290304;
