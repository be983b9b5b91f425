// Backup and restore on the embedded database: `npm run backup`, `npm run restore`, and the
// owner's download on Settings. The round trip must give back every row and every file byte for
// byte; a damaged or altered archive, or a running server, must leave the data as it was.
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import { openPglite } from '../helpers/pglite';
import * as tar from 'tar';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DiskStorage } from '$lib/server/storage';
import { sessionFor } from '../helpers/http';
import { seededDataDir, startServer, type TestServer } from '../helpers/server';

const run = promisify(execFile);
let dir: string;
let work: string;
let server: TestServer | undefined;

type Snapshot = { rows: Record<string, string>; files: Record<string, string> };

/**
 * Every table's row count and a digest of its whole content, and every file under the data
 * directory's files/ (side files included) by SHA-256: two snapshots are equal only when the
 * data is the same row for row and byte for byte.
 */
async function snapshot(dataDir: string): Promise<Snapshot> {
	const db = openPglite(dataDir);
	const rows: Record<string, string> = {};
	try {
		await db.waitReady;
		const tables = await db.query<{ s: string; t: string }>(
			`select table_schema as s, table_name as t from information_schema.tables
			 where table_type = 'BASE TABLE' and table_schema in ('public', 'drizzle') order by 1, 2`
		);
		for (const { s, t } of tables.rows) {
			const r = await db.query<{ n: number; d: string | null }>(
				`select count(*)::int as n, md5(string_agg(x::text, '|' order by x::text)) as d from "${s}"."${t}" x`
			);
			rows[`${s}.${t}`] = `${r.rows[0].n}:${r.rows[0].d}`;
		}
	} finally {
		await db.close();
	}
	const files: Record<string, string> = {};
	const root = path.join(dataDir, 'files');
	const walk = (d: string) => {
		if (!fs.existsSync(d)) return;
		for (const e of fs.readdirSync(d, { withFileTypes: true })) {
			const full = path.join(d, e.name);
			if (e.isDirectory()) walk(full);
			else
				files[path.relative(root, full)] = createHash('sha256')
					.update(fs.readFileSync(full))
					.digest('hex');
		}
	};
	walk(root);
	return { rows, files };
}

async function script(name: 'backup' | 'restore', arg: string) {
	try {
		const r = await run('npx', ['tsx', `scripts/${name}.ts`, arg], {
			env: { ...process.env, CLEARPITCH_DATA_DIR: dir, DATABASE_URL: '' }
		});
		return { code: 0, out: r.stdout, err: r.stderr };
	} catch (e) {
		const x = e as { code: number; stdout: string; stderr: string };
		return { code: x.code, out: x.stdout, err: x.stderr };
	}
}

/** Leftovers of a restore (its staging directories) beside the data directory. */
const leftovers = () =>
	fs.readdirSync(path.dirname(dir)).filter((n) => n.startsWith(path.basename(dir) + '.restore-'));

/** Rewrites an archive through `change` (unpacked in a directory), packed again with tar. */
async function altered(from: string, to: string, change: (d: string) => void) {
	const d = fs.mkdtempSync(path.join(work, 'alter-'));
	await tar.extract({ file: from, cwd: d });
	change(d);
	await tar.create({ gzip: true, file: to, cwd: d }, fs.readdirSync(d));
}

let archive: string;
let original: Snapshot;

beforeAll(async () => {
	dir = seededDataDir('backup');
	work = fs.mkdtempSync(path.join(path.dirname(dir), 'backup-work-'));
	// Uploaded files through the storage module, as the photo path stores them.
	const store = new DiskStorage(path.join(dir, 'files'));
	await store.put('photos/company-a/first', Buffer.from('first photo bytes'), 'image/jpeg');
	await store.put('photos/company-a/second', Buffer.alloc(300_000, 7), 'image/jpeg');
	await store.put('photos/company-a/thumbs/third', Buffer.from([0, 1, 2, 255]), 'image/png');
	original = await snapshot(dir);
});
afterAll(async () => {
	await server?.stop();
});

describe('npm run backup', () => {
	it('writes one archive with the dump, every file and a manifest of counts and checksums', async () => {
		archive = path.join(work, 'first.tar.gz');
		const r = await script('backup', archive);
		expect(r.code, r.err).toBe(0);
		expect(r.out).toMatch(/Backup written to .*first\.tar\.gz: pglite database, \d+ tables/);
		const listed: string[] = [];
		await tar.list({ file: archive, onReadEntry: (e) => listed.push(e.path) });
		expect(listed).toEqual(
			expect.arrayContaining([
				'manifest.json',
				'database/pglite.tar.gz',
				'files/photos/company-a/first',
				'files/photos/company-a/second',
				'files/photos/company-a/thumbs/third'
			])
		);
		const d = fs.mkdtempSync(path.join(work, 'look-'));
		await tar.extract({ file: archive, cwd: d });
		const m = JSON.parse(fs.readFileSync(path.join(d, 'manifest.json'), 'utf8'));
		expect(m.format).toBe('clearpitch-backup');
		expect(m.version).toBe(1);
		// The manifest's counts are the database's.
		for (const [t, v] of Object.entries(original.rows)) {
			expect(m.tables[t], t).toBe(Number(v.split(':')[0]));
		}
		expect(m.tables['public.users']).toBeGreaterThan(0);
		const second = m.files.find((f: { key: string }) => f.key === 'photos/company-a/second');
		expect(second).toMatchObject({ size: 300_000, contentType: 'image/jpeg' });
		expect(second.sha256).toBe(original.files['photos/company-a/second']);
	});
});

describe('npm run restore', () => {
	it('gives back identical rows in every table and identical files', async () => {
		// Changes made after the backup: a row, a file gone, a file added.
		const db = openPglite(dir);
		await db.waitReady;
		await db.query(
			`insert into customers (company_id, name) select company_id, 'Later Customer' from customers limit 1`
		);
		await db.close();
		const store = new DiskStorage(path.join(dir, 'files'));
		await store.delete('photos/company-a/first');
		await store.put('photos/company-a/later', Buffer.from('later'), 'image/jpeg');
		expect(await snapshot(dir)).not.toEqual(original);

		const r = await script('restore', archive);
		expect(r.code, r.err).toBe(0);
		expect(r.out).toMatch(/Restored the backup of .*counts checked/);
		expect(await snapshot(dir)).toEqual(original);
		// The data it replaced is kept aside, not deleted.
		const aside = r.out.match(/kept at (\S+);/)?.[1];
		expect(aside && fs.existsSync(path.join(aside, 'files/photos/company-a/later'))).toBe(true);
		expect(leftovers()).toEqual([]);
	});

	const refusals: [string, () => Promise<string>, RegExp][] = [
		[
			'a truncated archive',
			async () => {
				const to = path.join(work, 'truncated.tar.gz');
				const bytes = fs.readFileSync(archive);
				fs.writeFileSync(to, bytes.subarray(0, Math.floor(bytes.length * 0.6)));
				return to;
			},
			/cannot be read/
		],
		[
			'an archive with one byte changed',
			async () => {
				const to = path.join(work, 'flipped.tar.gz');
				const bytes = Buffer.from(fs.readFileSync(archive));
				bytes[Math.floor(bytes.length / 2)] ^= 0xff;
				fs.writeFileSync(to, bytes);
				return to;
			},
			/cannot be read/
		],
		[
			'a file that does not match its checksum',
			async () => {
				const to = path.join(work, 'tampered.tar.gz');
				await altered(archive, to, (d) =>
					fs.writeFileSync(path.join(d, 'files/photos/company-a/first'), 'other bytes')
				);
				return to;
			},
			/files\/photos\/company-a\/first does not match its checksum/
		],
		[
			'a file the manifest does not list',
			async () => {
				const to = path.join(work, 'extra.tar.gz');
				await altered(archive, to, (d) =>
					fs.writeFileSync(path.join(d, 'files/photos/company-a/extra'), 'x')
				);
				return to;
			},
			/does not list: files\/photos\/company-a\/extra/
		],
		[
			'a manifest of a format version this build does not know',
			async () => {
				const to = path.join(work, 'version.tar.gz');
				await altered(archive, to, (d) => {
					const p = path.join(d, 'manifest.json');
					const m = JSON.parse(fs.readFileSync(p, 'utf8'));
					fs.writeFileSync(p, JSON.stringify({ ...m, version: 2 }));
				});
				return to;
			},
			/manifest is not one this version of Clearpitch restores \(version/
		],
		[
			'counts that disagree with the dump',
			async () => {
				const to = path.join(work, 'counts.tar.gz');
				await altered(archive, to, (d) => {
					const p = path.join(d, 'manifest.json');
					const m = JSON.parse(fs.readFileSync(p, 'utf8'));
					m.tables['public.users'] += 1;
					fs.writeFileSync(p, JSON.stringify(m));
				});
				return to;
			},
			/does not match the manifest \(public\.users/
		],
		[
			'a file that is no archive at all',
			async () => {
				const to = path.join(work, 'not-an-archive.tar.gz');
				fs.writeFileSync(to, 'just some text');
				return to;
			},
			/cannot be read|no readable manifest/
		]
	];
	for (const [what, make, reason] of refusals) {
		it(`refuses ${what} and replaces nothing`, async () => {
			const before = await snapshot(dir);
			const r = await script('restore', await make());
			expect(r.code).toBe(1);
			expect(r.err).toMatch(/Restore refused, nothing was changed/);
			expect(r.err).toMatch(reason);
			expect(await snapshot(dir)).toEqual(before);
			expect(leftovers()).toEqual([]);
		});
	}
});

describe('with the server running', () => {
	beforeAll(async () => {
		server = await startServer(dir);
	});

	it('restore is refused while the server holds the data directory', async () => {
		const r = await script('restore', archive);
		expect(r.code).toBe(1);
		expect(r.err).toMatch(/Restore refused, nothing was changed: .*is in use by another process/);
		// The server is still answering from its data.
		expect((await fetch(`${server!.url}/api/health`)).status).toBe(200);
	});

	it('backup from the command line is refused and points to the button', async () => {
		const r = await script('backup', path.join(work, 'while-running.tar.gz'));
		expect(r.code).toBe(1);
		expect(r.err).toMatch(/use the Backup button on Settings/);
		expect(fs.existsSync(path.join(work, 'while-running.tar.gz'))).toBe(false);
	});

	it("the owner's download on Settings is an archive that restores to the same data", async () => {
		const estimator = await fetch(`${server!.url}/settings/backup`, {
			headers: { cookie: await sessionFor(server!.url, 'estimator') },
			redirect: 'manual'
		});
		expect(estimator.status).toBe(403);
		const owner = await sessionFor(server!.url, 'owner');
		const res = await fetch(`${server!.url}/settings/backup`, { headers: { cookie: owner } });
		expect(res.status).toBe(200);
		expect(res.headers.get('content-disposition')).toMatch(
			/^attachment; filename="clearpitch-backup-[\d-]+\.tar\.gz"$/
		);
		const downloaded = path.join(work, 'downloaded.tar.gz');
		fs.writeFileSync(downloaded, Buffer.from(await res.arrayBuffer()));
		await server!.stop();
		server = undefined;
		const atDownload = await snapshot(dir);
		// Something changes afterwards; the restore must undo it.
		await new DiskStorage(path.join(dir, 'files')).delete('photos/company-a/second');
		const r = await script('restore', downloaded);
		expect(r.code, r.err).toBe(0);
		const after = await snapshot(dir);
		expect(after.files).toEqual(atDownload.files);
		// A session's expiry may slide on the requests after the dump; the sessions are the same.
		const { 'public.sessions': s1, ...restAfter } = after.rows;
		const { 'public.sessions': s2, ...restBefore } = atDownload.rows;
		expect(restAfter).toEqual(restBefore);
		expect(s1.split(':')[0]).toBe(s2.split(':')[0]);
	});
});
