import { randomBytes } from 'node:crypto';
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import * as tar from 'tar';
import { lockDataDir } from '../db/lock';
import { openPglite } from '../db/pglite';
import { countTables, runPgTool } from './database';
import { digestFile, fileOf } from './files';
import { FILES_DIR, MANIFEST_NAME, manifestSchema, type Manifest } from './manifest';

/** The archive or the situation does not allow a restore; nothing has been replaced. */
export class RestoreRefused extends Error {
	override name = 'RestoreRefused';
}

export type RestoreTarget =
	{ kind: 'pglite'; dataDir: string } | { kind: 'postgres'; url: string; serverAppName: string };

export type FilesTarget = { store: 'disk'; root: string } | { store: 's3' };

export type RestoreResult = {
	manifest: Manifest;
	/** Where the data that was replaced now sits (kept until the owner removes it). */
	setAside: string[];
};

const stamp = () => new Date().toISOString().replace(/[:.]/g, '-');
const tmpName = (base: string, what: string) =>
	`${base}.${what}-${stamp()}-${randomBytes(4).toString('hex')}`;

async function exists(p: string): Promise<boolean> {
	return fs.stat(p).then(
		() => true,
		() => false
	);
}

/** Every regular file under `dir`, as archive paths with '/'. */
async function walk(dir: string, prefix = ''): Promise<string[]> {
	const out: string[] = [];
	for (const d of await fs.readdir(dir, { withFileTypes: true })) {
		const rel = prefix ? `${prefix}/${d.name}` : d.name;
		if (d.isDirectory()) out.push(...(await walk(path.join(dir, d.name), rel)));
		else out.push(rel);
	}
	return out;
}

/**
 * Unpacks the archive into `staging` and checks it whole: the manifest's format and version,
 * the database dump and every file against their size and SHA-256, and nothing in the archive
 * that the manifest does not name. Throws RestoreRefused on the first disagreement.
 */
async function unpackAndCheck(archive: string, staging: string): Promise<Manifest> {
	if (!(await exists(archive))) throw new RestoreRefused(`No archive at ${archive}.`);
	try {
		// strict: a truncated or damaged archive is an error, not a warning and half a restore.
		// tar refuses absolute paths and '..' unless told otherwise, and links are not wanted.
		// Read it through once without writing (a failed extraction can still be writing when it
		// reports), then unpack what has proved whole.
		await tar.list({ file: archive, strict: true });
		await tar.extract({
			file: archive,
			cwd: staging,
			strict: true,
			filter: (_p, entry) =>
				!('type' in entry) || entry.type === 'File' || entry.type === 'Directory'
		});
	} catch (e) {
		throw new RestoreRefused(
			`The archive cannot be read (${(e as Error).message}); it is damaged or not a Clearpitch backup.`
		);
	}
	let raw: unknown;
	try {
		raw = JSON.parse(await fs.readFile(path.join(staging, MANIFEST_NAME), 'utf8'));
	} catch {
		throw new RestoreRefused('The archive has no readable manifest.json.');
	}
	const parsed = manifestSchema.safeParse(raw);
	if (!parsed.success) {
		const first = parsed.error.issues[0];
		throw new RestoreRefused(
			`The manifest is not one this version of Clearpitch restores (${first.path.join('.') || 'manifest'}: ${first.message}).`
		);
	}
	const m = parsed.data;
	const expected = new Map<string, { size: number; sha256: string }>([
		[m.database.path, m.database]
	]);
	for (const f of m.files) expected.set(`${FILES_DIR}/${f.key}`, f);
	const found = (await walk(staging)).filter((p) => p !== MANIFEST_NAME);
	const extra = found.filter((p) => !expected.has(p));
	if (extra.length)
		throw new RestoreRefused(
			`The archive holds files its manifest does not list: ${extra.slice(0, 3).join(', ')}.`
		);
	for (const [p, want] of expected) {
		const full = path.join(staging, ...p.split('/'));
		if (!(await exists(full))) throw new RestoreRefused(`The archive lacks ${p}.`);
		const got = await digestFile(full);
		if (got.size !== want.size || got.sha256 !== want.sha256) {
			throw new RestoreRefused(`${p} does not match its checksum in the manifest.`);
		}
	}
	return m;
}

function sameCounts(want: Record<string, number>, got: Record<string, number>): string | null {
	for (const [t, n] of Object.entries(want)) {
		if (got[t] !== n) return `${t}: ${got[t] ?? 'missing'} rows where the backup has ${n}`;
	}
	return null;
}

/** Writes the archived files into a new directory laid out like the disk store. */
async function placeFiles(staging: string, m: Manifest, into: string): Promise<void> {
	await fs.rm(into, { recursive: true, force: true });
	await fs.mkdir(into, { recursive: true });
	for (const f of m.files) {
		const target = fileOf(into, f.key);
		await fs.mkdir(path.dirname(target), { recursive: true });
		await fs.rename(path.join(staging, FILES_DIR, ...f.key.split('/')), target);
		await fs.writeFile(`${target}.type`, f.contentType);
	}
}

/** Moves `fresh` into `live`'s place, keeping the old one beside it; undoes the first move on failure. */
async function swapIn(fresh: string, live: string): Promise<string | null> {
	const aside = tmpName(live, 'before-restore');
	const had = await exists(live);
	if (had) await fs.rename(live, aside);
	try {
		await fs.rename(fresh, live);
	} catch (e) {
		if (had) await fs.rename(aside, live);
		throw e;
	}
	return had ? aside : null;
}

/** Files inside the data directory (the default) travel with it; elsewhere, they swap on their own. */
function filesInside(dataDir: string, root: string): string | null {
	const rel = path.relative(dataDir, root);
	return rel && !rel.startsWith('..') && !path.isAbsolute(rel) ? rel : null;
}

async function restorePglite(
	archive: string,
	dataDir: string,
	files: FilesTarget
): Promise<RestoreResult> {
	// The server's own lock: a running server (or any script) holding it refuses the restore.
	const release = lockDataDir(dataDir);
	const staging = tmpName(dataDir, 'restore-archive');
	const freshDb = tmpName(dataDir, 'restore-db');
	const freshFiles = files.store === 'disk' ? tmpName(files.root, 'restore-files') : null;
	try {
		await fs.mkdir(staging, { recursive: true });
		const m = await unpackAndCheck(archive, staging);
		if (m.database.kind !== 'pglite') {
			throw new RestoreRefused(
				'This archive holds a PostgreSQL dump; restore it with DATABASE_URL set to that server.'
			);
		}
		if (m.filesStore === 'disk' && files.store !== 'disk') {
			throw new RestoreRefused(
				'This archive holds uploaded files, but files are set to go to a bucket.'
			);
		}
		// A new data directory beside the old one, opened and counted before anything moves.
		const dump = await fs.readFile(path.join(staging, m.database.path));
		const db = openPglite(freshDb, {
			loadDataDir: new Blob([dump], { type: 'application/x-gzip' })
		});
		try {
			await db.waitReady;
			const wrong = sameCounts(m.tables, await countTables((q) => db.query(q)));
			if (wrong)
				throw new RestoreRefused(`The restored database does not match the manifest (${wrong}).`);
		} finally {
			await db.close();
		}
		const setAside: string[] = [];
		if (files.store === 'disk' && m.filesStore === 'disk') {
			const inside = filesInside(dataDir, files.root);
			// PGlite's dump carries whatever sat in its directory; the checked files replace it.
			if (inside) await placeFiles(staging, m, path.join(freshDb, inside));
			else await placeFiles(staging, m, freshFiles!);
			const dbAside = await swapIn(freshDb, dataDir);
			if (dbAside) setAside.push(dbAside);
			if (!inside) {
				const filesAside = await swapIn(freshFiles!, files.root);
				if (filesAside) setAside.push(filesAside);
			}
		} else {
			const dbAside = await swapIn(freshDb, dataDir);
			if (dbAside) setAside.push(dbAside);
		}
		return { manifest: m, setAside };
	} finally {
		await fs.rm(staging, { recursive: true, force: true, maxRetries: 5 });
		await fs.rm(freshDb, { recursive: true, force: true, maxRetries: 5 });
		if (freshFiles) await fs.rm(freshFiles, { recursive: true, force: true });
		release();
	}
}

async function restorePostgres(
	archive: string,
	url: string,
	serverAppName: string,
	files: FilesTarget
): Promise<RestoreResult> {
	const client = new pg.Client({ connectionString: url, application_name: 'clearpitch-restore' });
	await client.connect();
	try {
		const busy = await client.query<{ n: number }>(
			'select count(*)::int as n from pg_stat_activity where datname = current_database() and application_name = $1',
			[serverAppName]
		);
		if (busy.rows[0].n > 0) {
			throw new RestoreRefused(
				'A Clearpitch server is connected to this database: stop it before restoring.'
			);
		}
	} finally {
		await client.end();
	}
	const staging = await fs.mkdtemp(path.join(os.tmpdir(), 'clearpitch-restore-'));
	const freshFiles = files.store === 'disk' ? tmpName(files.root, 'restore-files') : null;
	try {
		const m = await unpackAndCheck(archive, staging);
		if (m.database.kind !== 'postgres') {
			throw new RestoreRefused(
				'This archive holds an embedded (PGlite) database; restore it without DATABASE_URL.'
			);
		}
		if (m.filesStore === 'disk' && files.store !== 'disk') {
			throw new RestoreRefused(
				'This archive holds uploaded files, but files are set to go to a bucket.'
			);
		}
		if (freshFiles && m.filesStore === 'disk') await placeFiles(staging, m, freshFiles);
		// One transaction: the dump, then a check of every count that raises (and so rolls the
		// whole restore back) when one disagrees.
		const checks = Object.entries(m.tables)
			.map(([t, n]) => {
				const [s, name] = t.split('.');
				return `if (select count(*) from "${s}"."${name}") <> ${n} then raise exception 'restore check: ${t} has % rows, the backup ${n}', (select count(*) from "${s}"."${name}"); end if;`;
			})
			.join('\n');
		const verify = path.join(staging, 'verify.sql');
		await fs.writeFile(verify, `do $$ begin\n${checks}\nend $$;\n`);
		try {
			await runPgTool('psql', [
				'--no-psqlrc',
				'--quiet',
				'--single-transaction',
				'--set=ON_ERROR_STOP=1',
				`--file=${path.join(staging, m.database.path)}`,
				`--file=${verify}`,
				`--dbname=${url}`
			]);
		} catch (e) {
			throw new RestoreRefused(
				`PostgreSQL refused the dump; nothing was changed (${(e as Error).message}).`
			);
		}
		const setAside: string[] = [];
		if (freshFiles && m.filesStore === 'disk') {
			const aside = await swapIn(freshFiles, (files as { root: string }).root);
			if (aside) setAside.push(aside);
		}
		return { manifest: m, setAside };
	} finally {
		await fs.rm(staging, { recursive: true, force: true });
		if (freshFiles) await fs.rm(freshFiles, { recursive: true, force: true });
	}
}

/**
 * Replaces the database and the uploaded files with an archive's, after checking all of it.
 * A refused archive (damaged, truncated, altered, of another format) leaves the data as it was.
 */
export function restoreBackup(
	archive: string,
	target: RestoreTarget,
	files: FilesTarget
): Promise<RestoreResult> {
	return target.kind === 'pglite'
		? restorePglite(archive, target.dataDir, files)
		: restorePostgres(archive, target.url, target.serverAppName, files);
}
