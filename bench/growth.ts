/**
 * Growth suggestion: time per facet from decoded tiles to a grade (pixel collection under the
 * outline, the raster, the measures and the cuts), the median over every scene facet. Decoding
 * the WebP tiles is left out: the browser does that once per tile for the map anyway.
 * Run directly with `npx tsx bench/growth.ts` (needs `node geodata/generate-tiles.js`).
 */
import { performance } from 'node:perf_hooks';
import { pathToFileURL } from 'node:url';
import { featuresOf } from '../geodata/scene';
import { SAMPLE_MAX_ZOOM, TileCache } from '../geodata/tile-reader';
import {
	growthMeasures,
	rasterFromTiles,
	suggestGrade
} from '../src/lib/estimating/growth-suggest';
import { facetTilePixels } from '../src/lib/estimating/tile-pixels';

export interface GrowthBench {
	facets: number;
	medianMs: number;
	maxMs: number;
	medianPixels: number;
}

export async function benchGrowth(): Promise<GrowthBench> {
	const cache = new TileCache();
	const facets = featuresOf('facet');
	for (const f of facets) {
		const px = facetTilePixels(f.geometry, SAMPLE_MAX_ZOOM);
		if (px.ok) await cache.load(px.tiles);
	}
	const times: number[] = [];
	const pixels: number[] = [];
	for (const f of facets) {
		const t0 = performance.now();
		const px = facetTilePixels(f.geometry, SAMPLE_MAX_ZOOM);
		if (!px.ok) continue;
		const m = growthMeasures(rasterFromTiles(px.tiles, cache.get));
		if (m) suggestGrade(m);
		times.push(performance.now() - t0);
		pixels.push(px.count);
	}
	times.sort((a, b) => a - b);
	pixels.sort((a, b) => a - b);
	return {
		facets: times.length,
		medianMs: times[Math.floor(times.length / 2)],
		maxMs: times[times.length - 1],
		medianPixels: pixels[Math.floor(pixels.length / 2)]
	};
}

export function growthTable(r: GrowthBench): string {
	return [
		'| suggestion per facet (decoded tiles → grade) | median | slowest | median pixels |',
		'| --- | --- | --- | --- |',
		`| ${r.facets} scene facets, zoom ${SAMPLE_MAX_ZOOM} | ${r.medianMs.toFixed(2)} ms | ${r.maxMs.toFixed(2)} ms | ${r.medianPixels.toLocaleString('en-US')} |`
	].join('\n');
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
	console.log(growthTable(await benchGrowth()));
}
