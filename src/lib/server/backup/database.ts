import { spawn } from 'node:child_process';
import type { PGlite } from '@electric-sql/pglite';
import { openPglite } from '../db/pglite';
import pg from 'pg';

type Query = (text: string) => Promise<{ rows: unknown[] }>;

/** Every table of the application (the migrations' own bookkeeping included), by schema.name. */
const TABLES_SQL = `select table_schema as s, table_name as t from information_schema.tables
	where table_type = 'BASE TABLE' and table_schema not in ('pg_catalog', 'information_schema')
	order by 1, 2`;

const quote = (id: string) => `"${id.replace(/"/g, '""')}"`;

/** Rows per table, read through one connection (so inside one snapshot when the caller opened one). */
export async function countTables(query: Query): Promise<Record<string, number>> {
	const tables = (await query(TABLES_SQL)).rows as { s: string; t: string }[];
	const counts: Record<string, number> = {};
	for (const { s, t } of tables) {
		const r = await query(`select count(*)::int as n from ${quote(s)}.${quote(t)}`);
		counts[`${s}.${t}`] = (r.rows[0] as { n: number }).n;
	}
	return counts;
}

/** Opens a PGlite dump in memory, hands it to `use`, and closes it again. */
export async function withDumpInMemory<T>(
	dump: Uint8Array,
	use: (db: PGlite) => Promise<T>
): Promise<T> {
	const db = openPglite(undefined, {
		loadDataDir: new Blob([dump as Uint8Array<ArrayBuffer>], { type: 'application/x-gzip' })
	});
	try {
		await db.waitReady;
		return await use(db);
	} finally {
		await db.close();
	}
}

/**
 * PGlite's own dump of the open database. It runs between queries, so it may fall between two
 * requests of a running server; the counts are therefore read from the dump itself (opened in
 * memory), which also proves the dump opens before it is called a backup.
 */
export async function dumpPglite(
	client: PGlite
): Promise<{ bytes: Buffer; tables: Record<string, number> }> {
	const blob = await client.dumpDataDir('gzip');
	const bytes = Buffer.from(await blob.arrayBuffer());
	const tables = await withDumpInMemory(bytes, (db) => countTables((q) => db.query(q)));
	return { bytes, tables };
}

/** Runs a PostgreSQL client program; rejects with its stderr when it fails. */
export function runPgTool(cmd: string, args: string[], env: NodeJS.ProcessEnv = {}): Promise<void> {
	return new Promise((resolve, reject) => {
		const child = spawn(cmd, args, {
			stdio: ['ignore', 'ignore', 'pipe'],
			env: { ...process.env, ...env }
		});
		let err = '';
		child.stderr.on('data', (d) => (err += d));
		child.on('error', reject);
		child.on('exit', (code) =>
			code === 0 ? resolve() : reject(new Error(`${cmd} failed (${code}): ${err.trim()}`))
		);
	});
}

/**
 * `pg_dump` into `outFile`, plain SQL that drops and recreates every object. The counts and the
 * dump read the same exported snapshot, so a server writing meanwhile cannot make them disagree.
 */
export async function dumpPostgres(
	url: string,
	outFile: string
): Promise<{ tables: Record<string, number> }> {
	const client = new pg.Client({ connectionString: url, application_name: 'clearpitch-backup' });
	await client.connect();
	try {
		await client.query('begin transaction isolation level repeatable read read only');
		const snap = await client.query<{ id: string }>('select pg_export_snapshot() as id');
		const tables = await countTables((q) => client.query(q));
		await runPgTool('pg_dump', [
			'--format=plain',
			'--clean',
			'--if-exists',
			'--no-owner',
			'--no-privileges',
			`--snapshot=${snap.rows[0].id}`,
			`--file=${outFile}`,
			`--dbname=${url}`
		]);
		await client.query('commit');
		return { tables };
	} finally {
		await client.end();
	}
}
