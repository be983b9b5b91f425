// Backup and restore on PostgreSQL (DATABASE_URL, Debian's server and client programs): the round
// trip through pg_dump and psql gives back every row, and uploaded files kept outside the data
// directory; a restore whose counts disagree is rolled back whole; a connected server refuses it.
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import pg from 'pg';
import * as tar from 'tar';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DiskStorage } from '$lib/server/storage';
import { startPostgres, type TempPostgres } from '../helpers/postgres';
import { startServer, type TestServer } from '../helpers/server';

const run = promisify(execFile);
let pgServer: TempPostgres;
let app: TestServer | undefined;
let work: string;
let filesDir: string;
let env: NodeJS.ProcessEnv;

type Snapshot = { rows: Record<string, string>; files: Record<string, string> };

/** Every table's count and content digest, and every stored file's SHA-256. */
async function snapshot(): Promise<Snapshot> {
	const c = new pg.Client({ connectionString: pgServer.url });
	await c.connect();
	const rows: Record<string, string> = {};
	try {
		const tables = await c.query<{ s: string; t: string }>(
			`select table_schema as s, table_name as t from information_schema.tables
			 where table_type = 'BASE TABLE' and table_schema in ('public', 'drizzle') order by 1, 2`
		);
		for (const { s, t } of tables.rows) {
			const r = await c.query<{ n: number; d: string | null }>(
				`select count(*)::int as n, md5(string_agg(x::text, '|' order by x::text)) as d from "${s}"."${t}" x`
			);
			rows[`${s}.${t}`] = `${r.rows[0].n}:${r.rows[0].d}`;
		}
	} finally {
		await c.end();
	}
	const files: Record<string, string> = {};
	const walk = (d: string) => {
		if (!fs.existsSync(d)) return;
		for (const e of fs.readdirSync(d, { withFileTypes: true })) {
			const full = path.join(d, e.name);
			if (e.isDirectory()) walk(full);
			else
				files[path.relative(filesDir, full)] = createHash('sha256')
					.update(fs.readFileSync(full))
					.digest('hex');
		}
	};
	walk(filesDir);
	return { rows, files };
}

async function script(name: 'backup' | 'restore', arg: string) {
	try {
		const r = await run('npx', ['tsx', `scripts/${name}.ts`, arg], { env });
		return { code: 0, out: r.stdout, err: r.stderr };
	} catch (e) {
		const x = e as { code: number; stdout: string; stderr: string };
		return { code: x.code, out: x.stdout, err: x.stderr };
	}
}

let archive: string;
let original: Snapshot;

beforeAll(async () => {
	pgServer = await startPostgres();
	work = fs.mkdtempSync(path.resolve('tmp', 'backup-pg-'));
	filesDir = path.join(work, 'files');
	env = { ...process.env, DATABASE_URL: pgServer.url, CLEARPITCH_FILES_DIR: filesDir };
	await run('npx', ['tsx', 'scripts/migrate.ts'], { env });
	await run('npx', ['tsx', 'scripts/seed.ts'], { env });
	const store = new DiskStorage(filesDir);
	await store.put('photos/company-a/first', Buffer.from('first photo bytes'), 'image/jpeg');
	await store.put('photos/company-a/second', Buffer.alloc(200_000, 3), 'image/jpeg');
	original = await snapshot();
});
afterAll(async () => {
	await app?.stop();
	pgServer?.stop();
});

describe('on PostgreSQL', () => {
	it('backup → restore gives back identical rows and files', async () => {
		archive = path.join(work, 'pg.tar.gz');
		const b = await script('backup', archive);
		expect(b.code, b.err).toBe(0);
		expect(b.out).toMatch(/postgres database/);
		// Later changes: a row added, a file gone.
		const c = new pg.Client({ connectionString: pgServer.url });
		await c.connect();
		await c.query(
			`insert into customers (company_id, name) select company_id, 'Later Customer' from customers limit 1`
		);
		await c.end();
		await new DiskStorage(filesDir).delete('photos/company-a/first');
		expect(await snapshot()).not.toEqual(original);

		const r = await script('restore', archive);
		expect(r.code, r.err).toBe(0);
		expect(await snapshot()).toEqual(original);
		// The files it replaced are kept aside.
		expect(r.out).toMatch(/kept at .*files\.before-restore-/);
	});

	it('a restore whose counts disagree is rolled back whole', async () => {
		const d = fs.mkdtempSync(path.join(work, 'alter-'));
		await tar.extract({ file: archive, cwd: d });
		const p = path.join(d, 'manifest.json');
		const m = JSON.parse(fs.readFileSync(p, 'utf8'));
		m.tables['public.customers'] += 1;
		fs.writeFileSync(p, JSON.stringify(m));
		const bad = path.join(work, 'counts.tar.gz');
		await tar.create({ gzip: true, file: bad, cwd: d }, fs.readdirSync(d));
		// Something to lose if the rollback failed.
		const c = new pg.Client({ connectionString: pgServer.url });
		await c.connect();
		await c.query(
			`insert into customers (company_id, name) select company_id, 'Kept Customer' from customers limit 1`
		);
		await c.end();
		const before = await snapshot();
		const r = await script('restore', bad);
		expect(r.code).toBe(1);
		expect(r.err).toMatch(/PostgreSQL refused the dump; nothing was changed .*public\.customers/);
		expect(await snapshot()).toEqual(before);
	});

	it('restore is refused while a Clearpitch server is connected', async () => {
		app = await startServer(work, { DATABASE_URL: pgServer.url, CLEARPITCH_FILES_DIR: filesDir });
		const before = await snapshot();
		const r = await script('restore', archive);
		expect(r.code).toBe(1);
		expect(r.err).toMatch(/A Clearpitch server is connected to this database/);
		expect(await snapshot()).toEqual(before);
	});
});
