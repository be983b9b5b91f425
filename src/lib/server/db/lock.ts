import fs from 'node:fs';
import os from 'node:os';
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

type Owner = { pid: number; host: string };

const LOCK_OPTIONS = { stale: 10_000, update: 2_000, realpath: false } as const;

/** proper-lockfile's lock is a directory beside the data directory; who holds it sits next to it. */
const lockPath = (dir: string) => `${dir}.lock`;
const ownerPath = (dir: string) => `${dir}.lock.owner`;

function readOwner(dir: string): Owner | null {
	try {
		const o = JSON.parse(fs.readFileSync(ownerPath(dir), 'utf8')) as Partial<Owner>;
		return typeof o.pid === 'number' && typeof o.host === 'string'
			? { pid: o.pid, host: o.host }
			: null;
	} catch {
		return null;
	}
}

function alive(pid: number): boolean {
	try {
		process.kill(pid, 0);
		return true;
	} catch (e) {
		// EPERM: the process exists but belongs to someone else.
		return (e as NodeJS.ErrnoException).code === 'EPERM';
	}
}

/**
 * True when the lock was left by a process on this machine that no longer runs (a SIGKILL, an
 * out-of-memory kill). Another host's lock, an unreadable owner file or a live pid (even a reused
 * one) count as held: then only proper-lockfile's own 10 s staleness frees the lock.
 */
function heldByTheDead(dir: string): Owner | null {
	const owner = readOwner(dir);
	if (!owner || owner.host !== os.hostname() || owner.pid === process.pid) return null;
	return alive(owner.pid) ? null : owner;
}

function take(dir: string): () => void {
	const release = lockfile.lockSync(dir, LOCK_OPTIONS);
	fs.writeFileSync(ownerPath(dir), JSON.stringify({ pid: process.pid, host: os.hostname() }));
	return () => {
		try {
			fs.rmSync(ownerPath(dir), { force: true });
		} finally {
			release();
		}
	};
}

/**
 * PGlite does not lock its directory and a second opener silently corrupts it,
 * so we take an exclusive lock before opening and fail at once if it is held.
 * A server killed outright leaves its lock behind with a fresh mtime: proper-lockfile alone would
 * refuse a restart for 10 s, so the holder's pid is kept beside the lock and a lock whose holder
 * is gone is taken over at once.
 */
export function lockDataDir(dir: string): () => void {
	fs.mkdirSync(dir, { recursive: true });
	try {
		return take(dir);
	} catch (e) {
		if ((e as NodeJS.ErrnoException).code !== 'ELOCKED') throw e;
		const dead = heldByTheDead(dir);
		// Read again just before removing: a process that took the lock in the meantime has
		// written its own pid, and its lock must stay.
		if (!dead || readOwner(dir)?.pid !== dead.pid) throw new DataDirLockedError(dir);
		fs.rmSync(lockPath(dir), { recursive: true, force: true });
		try {
			return take(dir);
		} catch (again) {
			if ((again as NodeJS.ErrnoException).code === 'ELOCKED') throw new DataDirLockedError(dir);
			throw again;
		}
	}
}
