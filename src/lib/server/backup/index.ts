import { env } from '../env';
import { pgliteClient, SERVER_APP_NAME } from '../db';
import { createBackup, type FilesSource } from './create';
import { restoreBackup, type RestoreResult } from './restore';
import type { Manifest } from './manifest';

export { RestoreRefused } from './restore';

/** The configured file store, as the backup sees it. */
function filesStore(): FilesSource {
	return env.s3 ? { store: 's3' } : { store: 'disk', root: env.filesDir };
}

/**
 * A backup of the configured database and files into `outFile`. On PGlite it uses the process's
 * own open database (the server's, or the script's, which then holds the directory's lock).
 */
export async function backupTo(outFile: string): Promise<Manifest> {
	const url = env.databaseUrl;
	if (url) return createBackup({ kind: 'postgres', url }, filesStore(), outFile);
	const client = await pgliteClient();
	if (!client) throw new Error('The embedded database did not open.');
	return createBackup({ kind: 'pglite', client }, filesStore(), outFile);
}

/** Restores `archive` over the configured database and files; the database must not be open here. */
export function restoreFrom(archive: string): Promise<RestoreResult> {
	const url = env.databaseUrl;
	return restoreBackup(
		archive,
		url
			? { kind: 'postgres', url, serverAppName: SERVER_APP_NAME }
			: { kind: 'pglite', dataDir: env.dataDir },
		filesStore()
	);
}

/** A file name for a new archive, sortable by time. */
export function archiveName(now = new Date()): string {
	return `clearpitch-backup-${now.toISOString().slice(0, 19).replace(/[:T]/g, '-')}.tar.gz`;
}
