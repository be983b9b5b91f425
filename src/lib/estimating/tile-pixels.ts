import { booleanPointInPolygon } from '@turf/turf';
import type { Polygon, Position } from 'geojson';

/**
 * Which pixels of which XYZ tiles fall inside a facet outline. Pure maths (spherical Web
 * Mercator, EPSG:3857, as the map's tiles use), so the browser and Node tests pick the very
 * same pixels and the suggestion reads the same imagery the estimator sees.
 */

export const TILE_SIZE = 256;

export interface TilePixels {
	z: number;
	x: number;
	y: number;
	/** Indexes `py * TILE_SIZE + px` of pixels whose centre lies inside the outline. */
	pixels: number[];
}

/** Longitude/latitude to global pixel coordinates at zoom z (OSM "Slippy map tilenames"). */
export function lngLatToWorldPx(lng: number, lat: number, z: number): [number, number] {
	const scale = TILE_SIZE * 2 ** z;
	const phi = (lat * Math.PI) / 180;
	const x = ((lng + 180) / 360) * scale;
	const y = (1 - Math.log(Math.tan(phi) + 1 / Math.cos(phi)) / Math.PI) * 0.5 * scale;
	return [x, y];
}

function distToSegment(p: Position, a: Position, b: Position): number {
	const dx = b[0] - a[0];
	const dy = b[1] - a[1];
	const len2 = dx * dx + dy * dy;
	const t =
		len2 === 0 ? 0 : Math.max(0, Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2));
	return Math.hypot(p[0] - a[0] - t * dx, p[1] - a[1] - t * dy);
}

export interface PixelOptions {
	/**
	 * Pixels nearer the outline than this (in pixels) are left out: ridge caps, flashing, a
	 * neighbour's edge and a slightly loose outline all sit there and are not the facet's surface.
	 */
	insetPx?: number;
	/** Refuse outlines that would read more than this many pixels (a slip, not a roof plane). */
	maxPixels?: number;
}

export type FacetPixelsResult =
	{ ok: true; tiles: TilePixels[]; count: number } | { ok: false; reason: string };

/** The tiles a facet covers at zoom z and, for each, the pixels inside it. */
export function facetTilePixels(
	geometry: Polygon,
	z: number,
	{ insetPx = 3, maxPixels = 4_000_000 }: PixelOptions = {}
): FacetPixelsResult {
	const ringWorld = geometry.coordinates[0].map(([lng, lat]) => lngLatToWorldPx(lng, lat, z));
	const poly: Polygon = { type: 'Polygon', coordinates: [ringWorld] };
	const xs = ringWorld.map((p) => p[0]);
	const ys = ringWorld.map((p) => p[1]);
	const x0 = Math.floor(Math.min(...xs));
	const x1 = Math.ceil(Math.max(...xs));
	const y0 = Math.floor(Math.min(...ys));
	const y1 = Math.ceil(Math.max(...ys));
	if ((x1 - x0) * (y1 - y0) > maxPixels) {
		return { ok: false, reason: 'the facet is too large to read from the imagery at this zoom' };
	}
	const byTile = new Map<string, TilePixels>();
	let count = 0;
	for (let wy = y0; wy < y1; wy++) {
		for (let wx = x0; wx < x1; wx++) {
			const c: Position = [wx + 0.5, wy + 0.5];
			if (!booleanPointInPolygon(c, poly, { ignoreBoundary: true })) continue;
			if (insetPx > 0) {
				let near = false;
				for (let i = 0; i < ringWorld.length - 1 && !near; i++) {
					near = distToSegment(c, ringWorld[i], ringWorld[i + 1]) < insetPx;
				}
				if (near) continue;
			}
			const tx = Math.floor(wx / TILE_SIZE);
			const ty = Math.floor(wy / TILE_SIZE);
			const key = `${tx}/${ty}`;
			let t = byTile.get(key);
			if (!t) {
				t = { z, x: tx, y: ty, pixels: [] };
				byTile.set(key, t);
			}
			t.pixels.push((wy - ty * TILE_SIZE) * TILE_SIZE + (wx - tx * TILE_SIZE));
			count++;
		}
	}
	if (count === 0) return { ok: false, reason: 'the facet is too small to read from the imagery' };
	return { ok: true, tiles: [...byTile.values()], count };
}
