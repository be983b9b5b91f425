// The embedded database runs no autovacuum (PGlite is one process with no background workers),
// so Clearpitch measures grown tables itself (src/lib/server/db/maintenance.ts). Checked on
// PGlite with the project's own migrations: after a bulk load the planner's row counts are
// unknown (pg_class.reltuples = -1, PostgreSQL 14+ docs, "pg_class") until VACUUM/ANALYZE; after
// the tidy they are the real counts, the site search reads its trigram index (pg_trgm docs:
// "Index Support" for LIKE/ILIKE) and a count reads the index alone once pages are all-visible.
import { drizzle } from 'drizzle-orm/pglite';
import { migrate } from 'drizzle-orm/pglite/migrator';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tidyTables } from '../../src/lib/server/db/maintenance';
import { openPglite } from '../helpers/pglite';

const db = openPglite();
let company = '';

async function bulkSites(from: number, n: number) {
	// One statement per table, the way a CSV import or a seed loads many rows at once.
	await db.query(
		`with c as (
		   insert into customers (company_id, name)
		   select $1, 'Customer ' || g from generate_series($2::int, $3::int) g returning id, name)
		 insert into sites (company_id, customer_id, address, lat, lon)
		 select $1, c.id, split_part(c.name, ' ', 2) || ' '
		        || (array['Alder','Heron','Quarry','Tanner'])[1 + split_part(c.name, ' ', 2)::int % 4]
		        || ' Lane, Wrenfield', 35.5, -74.4
		   from c`,
		[company, from, from + n - 1]
	);
}

const reltuples = async (table: string) =>
	(
		await db.query<{ n: number }>(`select reltuples::int as n from pg_class where relname = $1`, [
			table
		])
	).rows[0].n;

async function plan(sql: string, params: unknown[]) {
	const { rows } = await db.query<{ 'QUERY PLAN': string }>(`explain ${sql}`, params);
	return rows.map((r) => r['QUERY PLAN']).join('\n');
}

beforeAll(async () => {
	await migrate(drizzle(db), { migrationsFolder: 'drizzle' });
	company = (
		await db.query<{ id: string }>(`insert into companies (name) values ('Test Co') returning id`)
	).rows[0].id;
	await bulkSites(1, 6000);
}, 120_000);

afterAll(() => db.close());

describe('tidying the embedded database', () => {
	it('finds the bulk-loaded tables unmeasured, then measures them', async () => {
		expect(await reltuples('sites')).toBe(-1);
		const tidied = await tidyTables(db);
		expect(tidied).toEqual(expect.arrayContaining(['customers', 'sites']));
		expect(await reltuples('sites')).toBe(6000);
		expect(await reltuples('customers')).toBe(6000);
	});

	it('then searches through the trigram index, with every page marked all-visible for counts', async () => {
		const search = await plan(
			`select count(*) from sites where company_id = $1 and address ilike $2`,
			[company, '%Heron%']
		);
		expect(search).toMatch(/Bitmap Index Scan on sites_address_trgm_idx/);
		// A count reads the index alone only where the visibility map marks pages all-visible,
		// which only VACUUM does.
		const { rows } = await db.query<{ all_visible: number; pages: number }>(
			`select relallvisible as all_visible, relpages as pages from pg_class where relname = 'sites'`
		);
		expect(rows[0].pages).toBeGreaterThan(0);
		expect(rows[0].all_visible).toBe(rows[0].pages);
	});

	it('leaves tables that have not grown alone, and measures one again when it has', async () => {
		expect(await tidyTables(db)).toEqual([]);
		await bulkSites(6001, 3000);
		const tidied = await tidyTables(db);
		expect(tidied).toEqual(expect.arrayContaining(['customers', 'sites']));
		expect(tidied).not.toContain('companies');
		expect(await reltuples('sites')).toBe(9000);
	});
});
