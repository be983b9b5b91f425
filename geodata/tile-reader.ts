/**
 * Decoded sample tiles for Node scripts and tests: the same WebP files the map shows, read with
 * sharp into RGBA, so a suggestion measured here is the one the editor would make.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import sharp from 'sharp';
import { featuresOf } from './scene';
import { facetTilePixels, type TilePixels } from '../src/lib/estimating/tile-pixels';
import {
	growthMeasures,
	rasterFromTiles,
	type GrowthMeasures
} from '../src/lib/estimating/growth-suggest';
import type { GrowthGrade } from '../src/lib/estimating/types';

export const TILES_DIR = fileURLToPath(new URL('./tiles', import.meta.url));
/** The highest zoom the generator draws (tiles/tiles.json maxzoom). */
export const SAMPLE_MAX_ZOOM = 21;

export class TileCache {
	private readonly tiles = new Map<string, Uint8Array | undefined>();
	constructor(private readonly dir = TILES_DIR) {}
	key = (t: Pick<TilePixels, 'z' | 'x' | 'y'>) => `${t.z}/${t.x}/${t.y}`;
	async load(list: readonly TilePixels[]): Promise<void> {
		for (const t of list) {
			const k = this.key(t);
			if (this.tiles.has(k)) continue;
			try {
				const { data } = await sharp(path.join(this.dir, `${k}.webp`))
					.ensureAlpha()
					.raw()
					.toBuffer({ resolveWithObject: true });
				this.tiles.set(k, new Uint8Array(data));
			} catch {
				this.tiles.set(k, undefined);
			}
		}
	}
	get = (t: TilePixels) => this.tiles.get(this.key(t));
}

export interface SceneFacetMeasure {
	facetId: string;
	material: string;
	truth: GrowthGrade;
	measures: GrowthMeasures;
}

/** Every scene facet's measures, read from the generated tiles at the highest zoom. */
export async function measureSceneFacets(cache = new TileCache()): Promise<SceneFacetMeasure[]> {
	const out: SceneFacetMeasure[] = [];
	for (const f of featuresOf('facet')) {
		const px = facetTilePixels(f.geometry, SAMPLE_MAX_ZOOM);
		if (!px.ok) throw new Error(`${f.properties.facetId}: ${px.reason}`);
		await cache.load(px.tiles);
		const m = growthMeasures(rasterFromTiles(px.tiles, cache.get));
		if (!m) throw new Error(`${f.properties.facetId}: too few pixels`);
		out.push({
			facetId: f.properties.facetId,
			material: f.properties.material,
			truth: f.properties.growth,
			measures: m
		});
	}
	return out;
}
