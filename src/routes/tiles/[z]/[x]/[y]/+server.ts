import fs from 'node:fs/promises';
import path from 'node:path';
import { error } from '@sveltejs/kit';
import { env } from '$lib/server/env';
import type { RequestHandler } from './$types';

const TILE = /^(\d{1,2})\/(\d{1,8})\/(\d{1,8})\.webp$/;

/**
 * The bundled sample imagery. Tiles are generated from geodata/scene.geojson and never
 * change for a given scene, so they may be cached for a day; the stable URL is the contract.
 */
export const GET: RequestHandler = async ({ params }) => {
	const rel = `${params.z}/${params.x}/${params.y}`;
	if (!TILE.test(rel)) error(404, 'No such tile.');
	try {
		const body = await fs.readFile(path.join(env.tilesDir, rel));
		return new Response(new Uint8Array(body), {
			headers: {
				'content-type': 'image/webp',
				'cache-control': 'public, max-age=86400'
			}
		});
	} catch {
		// Outside the scene: an empty 204 keeps map libraries quiet without a 404 per tile.
		return new Response(null, {
			status: 204,
			headers: { 'cache-control': 'public, max-age=86400' }
		});
	}
};
