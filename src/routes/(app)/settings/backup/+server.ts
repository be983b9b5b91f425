import { createReadStream } from 'node:fs';
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { requireRole } from '$lib/server/auth/guard';
import { archiveName, backupTo } from '$lib/server/backup';
import type { RequestHandler } from './$types';

/**
 * The owner's backup button: the same archive `npm run backup` writes, made by the running
 * server from its own open database (a second process could not open PGlite's directory).
 * One installation holds one company, so the archive is the whole installation's data.
 */
export const GET: RequestHandler = async (event) => {
	requireRole(event, 'owner');
	const dir = await fs.mkdtemp(path.join(os.tmpdir(), 'clearpitch-download-'));
	const name = archiveName();
	const file = path.join(dir, name);
	try {
		await backupTo(file);
	} catch (e) {
		await fs.rm(dir, { recursive: true, force: true });
		throw e;
	}
	const { size } = await fs.stat(file);
	const stream = createReadStream(file);
	// The temporary copy goes as soon as the download ends, finished or not.
	stream.on('close', () => void fs.rm(dir, { recursive: true, force: true }));
	return new Response(Readable.toWeb(stream) as ReadableStream, {
		headers: {
			'content-type': 'application/gzip',
			'content-length': String(size),
			'content-disposition': `attachment; filename="${name}"`,
			'cache-control': 'no-store'
		}
	});
};
