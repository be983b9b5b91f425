import fs from 'node:fs';
import lockfile from 'proper-lockfile';

export class DataDirLockedError extends Error {
	constructor(dir: string) {
		super(
			`The Clearpitch data directory ${dir} is in use by another process. ` +
				'PGlite allows one process per data directory: stop the other server or script, ' +
				'or point CLEARPITCH_DATA_DIR elsewhere.'
		);
		this.name = 'DataDirLockedError';
	}
}

/**
 * PGlite does not lock its directory and a second opener silently corrupts it,
 * so we take an exclusive lock before opening and fail at once if it is held.
 * The lock goes stale 10 s after its holder dies, so a crashed server can be restarted.
 */
export function lockDataDir(dir: string): () => void {
	fs.mkdirSync(dir, { recursive: true });
	try {
		return lockfile.lockSync(dir, { stale: 10_000, update: 2_000, realpath: false });
	} catch (e) {
		if ((e as NodeJS.ErrnoException).code === 'ELOCKED') throw new DataDirLockedError(dir);
		throw e;
	}
}
