import fs from 'node:fs/promises';
import path from 'node:path';
import { error, json } from '@sveltejs/kit';
import { env } from '$lib/server/env';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async () => {
	try {
		const text = await fs.readFile(path.join(env.tilesDir, 'tiles.json'), 'utf8');
		return json(JSON.parse(text), { headers: { 'cache-control': 'public, max-age=300' } });
	} catch {
		error(404, 'The sample imagery has not been generated: run `npm run geodata`.');
	}
};
