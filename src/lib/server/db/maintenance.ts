import type { PGlite } from '@electric-sql/pglite';

/**
 * The embedded database has no autovacuum, so without this the planner keeps the statistics of
 * empty tables (and picks sequential scans over the search indexes), and counts can't use
 * index-only scans because no page is ever marked all-visible. A PostgreSQL server does this
 * itself; on PGlite Clearpitch vacuums and analyzes, like autovacuum's growth trigger, the tables
 * that were never measured or have grown by a fifth (and 8 pages) since they last were.
 */
const GROWN_TABLES = `
	select string_agg(quote_ident(c.relname), ', ' order by c.relname) as tables
	  from pg_class c join pg_namespace n on n.oid = c.relnamespace
	 where n.nspname = 'public' and c.relkind = 'r'
	   and (c.reltuples < 0
	        or pg_relation_size(c.oid) / current_setting('block_size')::int > c.relpages * 1.2 + 8)`;

/** How often a running server looks again; the look is one catalog read when nothing grew. */
export const TIDY_EVERY_MS = 60 * 60_000;

/** Vacuums and analyzes the tables that need it; returns their names (empty when none did). */
export async function tidyTables(client: PGlite): Promise<string[]> {
	const { rows } = await client.query<{ tables: string | null }>(GROWN_TABLES);
	const tables = rows[0]?.tables;
	if (!tables) return [];
	// The names come quoted from PostgreSQL itself (quote_ident), not from any input.
	await client.exec(`VACUUM (ANALYZE) ${tables}`);
	return tables.split(', ');
}
