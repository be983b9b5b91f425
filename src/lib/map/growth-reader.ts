import type { Polygon } from 'geojson';
import {
	DEFAULT_GROWTH_THRESHOLDS,
	growthMeasures,
	rasterFromTiles,
	suggestGrade,
	type GrowthThresholds
} from '../estimating/growth-suggest';
import { facetTilePixels, type TilePixels } from '../estimating/tile-pixels';
import type { GrowthSuggestionRecord } from '../schemas/facet';
import type { Imagery } from './imagery';

/**
 * Reads the map's own tiles under a facet in the browser and suggests a growth grade. Another
 * imagery source may refuse to let its pixels be read (no CORS headers); then there is simply
 * no suggestion, and the reason says so.
 */

export type GrowthReading =
	{ ok: true; suggestion: GrowthSuggestionRecord } | { ok: false; reason: string };

/** The pixel classifier is tuned at this zoom; deeper tiles from another source are not needed. */
const READ_ZOOM_CAP = 21;

const tileUrl = (template: string, t: TilePixels) =>
	template
		.replace('{z}', String(t.z))
		.replace('{x}', String(t.x))
		.replace('{y}', String(t.y))
		.replace('{s}', 'a');

async function readTile(url: string): Promise<Uint8ClampedArray> {
	const res = await fetch(url, { mode: 'cors', credentials: 'same-origin' });
	if (!res.ok) throw new Error(`tile answered ${res.status}`);
	const bitmap = await createImageBitmap(await res.blob());
	const canvas = new OffscreenCanvas(bitmap.width, bitmap.height);
	const ctx = canvas.getContext('2d', { willReadFrequently: true });
	if (!ctx) throw new Error('no 2-D canvas');
	ctx.drawImage(bitmap, 0, 0);
	bitmap.close();
	return ctx.getImageData(0, 0, canvas.width, canvas.height).data;
}

const cache = new Map<string, Promise<Uint8ClampedArray>>();

export async function readGrowth(
	geometry: Polygon,
	imagery: Imagery,
	thresholds: GrowthThresholds = DEFAULT_GROWTH_THRESHOLDS
): Promise<GrowthReading> {
	const z = Math.min(imagery.maxZoom, READ_ZOOM_CAP);
	const px = facetTilePixels(geometry, z);
	if (!px.ok) return { ok: false, reason: `No suggestion: ${px.reason}.` };
	const decoded = new Map<TilePixels, Uint8ClampedArray>();
	try {
		for (const t of px.tiles) {
			const url = tileUrl(imagery.tiles, t);
			let p = cache.get(url);
			if (!p) {
				p = readTile(url);
				cache.set(url, p);
				p.catch(() => cache.delete(url));
			}
			decoded.set(t, await p);
		}
	} catch {
		return {
			ok: false,
			reason: imagery.sample
				? 'No suggestion: the imagery tiles could not be read.'
				: 'No suggestion: this imagery source does not allow its pixels to be read in the browser.'
		};
	}
	const measures = growthMeasures(rasterFromTiles(px.tiles, (t) => decoded.get(t)));
	if (!measures) return { ok: false, reason: 'No suggestion: the facet is too small to read.' };
	const s = suggestGrade(measures, thresholds);
	return { ok: true, suggestion: { grade: s.grade, confidence: s.confidence, measures } };
}
