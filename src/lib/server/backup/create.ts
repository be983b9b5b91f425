import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import type { PGlite } from '@electric-sql/pglite';
import * as tar from 'tar';
import { digestFile, fileOf, listStoredFiles } from './files';
import { dumpPglite, dumpPostgres } from './database';
import {
	BACKUP_FORMAT,
	BACKUP_VERSION,
	FILES_DIR,
	MANIFEST_NAME,
	PGLITE_DUMP,
	POSTGRES_DUMP,
	type Manifest
} from './manifest';

export type BackupSource = { kind: 'pglite'; client: PGlite } | { kind: 'postgres'; url: string };

/** Where the uploaded files are: a directory on this disk, or a bucket the backup leaves alone. */
export type FilesSource = { store: 'disk'; root: string } | { store: 's3' };

/**
 * Writes one archive (gzipped tar) holding the database dump, every uploaded file and a manifest
 * with their sizes and SHA-256, plus the rows per table. It is built in a private temporary
 * directory and renamed into place, so `outFile` is either a whole archive or absent.
 */
export async function createBackup(
	source: BackupSource,
	files: FilesSource,
	outFile: string
): Promise<Manifest> {
	const staging = await fs.mkdtemp(path.join(os.tmpdir(), 'clearpitch-backup-'));
	const partial = `${outFile}.partial-${process.pid}`;
	try {
		await fs.mkdir(path.join(staging, 'database'));
		let database: Manifest['database'];
		let tables: Manifest['tables'];
		if (source.kind === 'pglite') {
			const dump = await dumpPglite(source.client);
			await fs.writeFile(path.join(staging, PGLITE_DUMP), dump.bytes);
			tables = dump.tables;
			database = {
				kind: 'pglite',
				path: PGLITE_DUMP,
				...(await digestFile(path.join(staging, PGLITE_DUMP)))
			};
		} else {
			tables = (await dumpPostgres(source.url, path.join(staging, POSTGRES_DUMP))).tables;
			database = {
				kind: 'postgres',
				path: POSTGRES_DUMP,
				...(await digestFile(path.join(staging, POSTGRES_DUMP)))
			};
		}
		// After the database: a file whose row is in the dump was stored before the row was.
		const listed: Manifest['files'] = [];
		if (files.store === 'disk') {
			const filesDir = path.join(staging, FILES_DIR);
			await fs.mkdir(filesDir);
			for (const f of await listStoredFiles(files.root)) {
				const copy = fileOf(filesDir, f.key);
				await fs.mkdir(path.dirname(copy), { recursive: true });
				try {
					await fs.copyFile(fileOf(files.root, f.key), copy);
				} catch (e) {
					// Deleted since it was listed: it is no longer part of the data.
					if ((e as NodeJS.ErrnoException).code === 'ENOENT') continue;
					throw e;
				}
				// The digest of the copy, so the manifest describes exactly what is archived.
				listed.push({ ...f, ...(await digestFile(copy)) });
			}
		}
		const manifest: Manifest = {
			format: BACKUP_FORMAT,
			version: BACKUP_VERSION,
			createdAt: new Date().toISOString(),
			database,
			tables,
			filesStore: files.store,
			files: listed
		};
		await fs.writeFile(path.join(staging, MANIFEST_NAME), JSON.stringify(manifest, null, '\t'));
		await fs.mkdir(path.dirname(outFile), { recursive: true });
		const entries = [MANIFEST_NAME, 'database', ...(files.store === 'disk' ? [FILES_DIR] : [])];
		await tar.create({ gzip: true, file: partial, cwd: staging, portable: true }, entries);
		await fs.rename(partial, outFile);
		return manifest;
	} finally {
		await fs.rm(partial, { force: true });
		await fs.rm(staging, { recursive: true, force: true });
	}
}
