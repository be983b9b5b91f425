import { createRequire } from 'node:module';
import type { Polygon } from 'geojson';
import { meridionalRadius, primeVerticalRadius } from '../../../src/lib/estimating/geometry';
import type { FacetInput } from '../../../src/lib/estimating';

// GeographicLib ships CommonJS without named ESM exports.
const require = createRequire(import.meta.url);
export const { Geodesic } =
	require('geographiclib-geodesic') as typeof import('geographiclib-geodesic');

const DEG = Math.PI / 180;
const M_PER_FT = 0.3048;

/**
 * A local tangent plane at (lat0, lon0) built from the WGS84 radii there
 * (x = N·cosφ0·Δλ, y = M·Δφ): corners given in metres land where the ellipsoid puts them,
 * to second order, so a shape centred on the origin keeps its plane area.
 */
export function localPlane(lat0: number, lon0: number) {
	const m = meridionalRadius(lat0);
	const n = primeVerticalRadius(lat0);
	const toLonLat = ([x, y]: readonly [number, number]): [number, number] => [
		lon0 + x / (n * Math.cos(lat0 * DEG)) / DEG,
		lat0 + y / m / DEG
	];
	return {
		toLonLat,
		polygonM(corners: ReadonlyArray<readonly [number, number]>): Polygon {
			const ring = corners.map(toLonLat);
			ring.push([...ring[0]] as [number, number]);
			return { type: 'Polygon', coordinates: [ring] };
		},
		polygonFt(corners: ReadonlyArray<readonly [number, number]>): Polygon {
			return this.polygonM(corners.map(([x, y]) => [x * M_PER_FT, y * M_PER_FT] as const));
		},
		/** Rectangle centred on the plane's origin, w × h feet. */
		rectFt(w: number, h: number, cx = 0, cy = 0): Polygon {
			return this.polygonFt([
				[cx - w / 2, cy - h / 2],
				[cx + w / 2, cy - h / 2],
				[cx + w / 2, cy + h / 2],
				[cx - w / 2, cy + h / 2]
			]);
		}
	};
}

/** GeographicLib's ellipsoidal area of a GeoJSON ring, m² (abs: winding does not matter). */
export function geographicLibAreaM2(polygon: Polygon): number {
	const p = Geodesic.WGS84.Polygon(false);
	const ring = polygon.coordinates[0];
	for (let i = 0; i < ring.length - 1; i++) p.AddPoint(ring[i][1], ring[i][0]);
	return Math.abs(p.Compute(false, true).area!);
}

/** Invented demo location: the sample scene's open-sea coordinates, where no real town stands. */
export const WRENFIELD = { lat: 35.52, lon: -74.46 };

export function facet(overrides: Partial<FacetInput> & { geometry: Polygon }): FacetInput {
	return {
		id: 'f1',
		pitch: 6,
		material: 'asphalt_shingle',
		growth: 'G1',
		access: 'ground',
		stories: 1,
		...overrides
	};
}

/** A plain ranch-style test roof: two 40 × 15 ft gable halves at 6/12. */
export function gableRoof(lat = WRENFIELD.lat, lon = WRENFIELD.lon): FacetInput[] {
	const plane = localPlane(lat, lon);
	return [
		facet({
			id: 'south',
			geometry: plane.rectFt(40, 15, 0, -7.5),
			edges: ['eave', 'rake', 'ridge', 'rake']
		}),
		facet({
			id: 'north',
			geometry: plane.rectFt(40, 15, 0, 7.5),
			edges: ['ridge', 'rake', 'eave', 'rake']
		})
	];
}
