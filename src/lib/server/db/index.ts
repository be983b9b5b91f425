import type { PGlite } from '@electric-sql/pglite';
import { drizzle as drizzlePglite, type PgliteDatabase } from 'drizzle-orm/pglite';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import { drizzle as drizzlePg } from 'drizzle-orm/node-postgres';
import { migrate as migratePg } from 'drizzle-orm/node-postgres/migrator';
import pg from 'pg';
import { env } from '../env';
import { lockDataDir } from './lock';
import { TIDY_EVERY_MS, tidyTables } from './maintenance';
import { openPglite } from './pglite';
import * as schema from './schema';

/** Both drivers expose the same query builder; we type against the PGlite one. */
export type Db = PgliteDatabase<typeof schema>;

type Opened = { db: Db; close: () => Promise<void>; kind: 'pglite' | 'postgres' };

let opening: Promise<Opened> | undefined;

/** How the server's connections name themselves to PostgreSQL, so a restore can see it running. */
export const SERVER_APP_NAME = 'clearpitch';

async function open(): Promise<Opened> {
	const url = env.databaseUrl;
	if (url) {
		const pool = new pg.Pool({ connectionString: url, max: 10, application_name: SERVER_APP_NAME });
		const db = drizzlePg(pool, { schema }) as unknown as Db;
		await migratePg(db as never, { migrationsFolder: env.migrationsDir });
		return { db, kind: 'postgres', close: () => pool.end() };
	}
	const dir = env.dataDir;
	const release = lockDataDir(dir);
	try {
		const client = openPglite(dir);
		await client.waitReady;
		const db = drizzlePglite(client, { schema });
		await migratePglite(db, { migrationsFolder: env.migrationsDir });
		// Measured before the first request, so a data set loaded in bulk (a seed, a restore)
		// is searched through its indexes from the start; then again now and then.
		await tidyTables(client);
		let tidying: Promise<unknown> = Promise.resolve();
		const timer = setInterval(() => {
			tidying = tidying.then(() => tidyTables(client)).catch((e) => console.error('tidy:', e));
		}, TIDY_EVERY_MS);
		timer.unref();
		return {
			db,
			kind: 'pglite',
			close: async () => {
				clearInterval(timer);
				try {
					await tidying;
					await client.close();
				} finally {
					release();
				}
			}
		};
	} catch (e) {
		release();
		throw e;
	}
}

/** Opens the database on first use (never at import: `vite build` imports this module). */
export function getDb(): Promise<Db> {
	opening ??= open();
	return opening.then((o) => o.db);
}

/** The embedded database's own client (for its dump); null on PostgreSQL. */
export async function pgliteClient(): Promise<PGlite | null> {
	opening ??= open();
	const o = await opening;
	return o.kind === 'pglite' ? (o.db as unknown as { $client: PGlite }).$client : null;
}

/** After a bulk load on the embedded database: measure the grown tables now, not within the hour. */
export async function tidyAfterBulkLoad(): Promise<void> {
	const client = await pgliteClient();
	if (client) await tidyTables(client).catch((e) => console.error('tidy:', e));
}

export async function databaseKind(): Promise<Opened['kind']> {
	opening ??= open();
	return (await opening).kind;
}

export async function closeDb(): Promise<void> {
	if (!opening) return;
	const o = opening;
	opening = undefined;
	await (await o).close();
}

export { schema };
