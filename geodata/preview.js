// @ts-check
/**
 * Stitches a block of freshly rendered tiles into one PNG, to look at the imagery without a map.
 *
 *   node geodata/preview.js                                  # z20, 3 × 3, over h01 and h02
 *   node geodata/preview.js --house h07 --z 21 --size 2 --out /tmp/h07.png
 *   node geodata/preview.js --at 35.5202,-74.4599 --z 18
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { createCanvas, ImageData } from '@napi-rs/canvas';
import { renderTile, SCENE_FILE, TILE_SIZE, tileOf } from './generate-tiles.js';

const { values } = parseArgs({
	options: {
		z: { type: 'string', default: '20' },
		size: { type: 'string', default: '3' },
		house: { type: 'string' },
		at: { type: 'string' },
		out: { type: 'string', default: '/tmp/scene-preview.png' }
	}
});

const z = Number(values.z);
const size = Number(values.size);
/** @type {[number, number]} */
let centre;
if (values.at) {
	const [lat, lon] = values.at.split(',').map(Number);
	centre = [lon, lat];
} else {
	const scene = JSON.parse(readFileSync(SCENE_FILE, 'utf8'));
	const ids = (values.house ?? 'h01,h02').split(',');
	const hs = scene.features.filter(
		(/** @type {any} */ f) => f.properties.kind === 'house' && ids.includes(f.properties.houseId)
	);
	if (!hs.length) throw new Error(`no house ${ids.join(', ')} in the scene`);
	centre = [
		hs.reduce((/** @type {number} */ s, /** @type {any} */ h) => s + h.properties.lon, 0) /
			hs.length,
		hs.reduce((/** @type {number} */ s, /** @type {any} */ h) => s + h.properties.lat, 0) /
			hs.length
	];
}

const c = tileOf(centre[0], centre[1], z);
const canvas = createCanvas(TILE_SIZE * size, TILE_SIZE * size);
const ctx = canvas.getContext('2d');
const t0 = performance.now();
const half = Math.floor(size / 2);
for (let dx = 0; dx < size; dx++)
	for (let dy = 0; dy < size; dy++) {
		const img = renderTile(z, c.x + dx - half, c.y + dy - half);
		ctx.putImageData(
			new ImageData(img.data, img.width, img.height),
			dx * TILE_SIZE,
			dy * TILE_SIZE
		);
	}
writeFileSync(values.out, canvas.encodeSync('png'));
console.log(
	`wrote ${values.out}: z${z} tiles ${c.x - half}..${c.x - half + size - 1} × ${c.y - half}..${c.y - half + size - 1} in ${Math.round(performance.now() - t0)} ms`
);
