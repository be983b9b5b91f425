// drizzle/0006: estimates stored before the one facet shape kept their outline under `polygon`;
// the migration renames it to `geometry` and changes nothing else. Run on PGlite with the
// project's own migration files, in journal order, the way drizzle's migrator applies them.
import type { PGlite } from '@electric-sql/pglite';
import { openPglite } from '../helpers/pglite';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const DIR = path.resolve('drizzle');
const journal = JSON.parse(fs.readFileSync(path.join(DIR, 'meta/_journal.json'), 'utf8')) as {
	entries: { idx: number; tag: string }[];
};

async function apply(db: PGlite, tag: string) {
	const sql = fs.readFileSync(path.join(DIR, `${tag}.sql`), 'utf8');
	for (const statement of sql.split('--> statement-breakpoint')) {
		if (statement.trim()) await db.exec(statement);
	}
}

const outline = {
	type: 'Polygon',
	coordinates: [
		[
			[-74.46, 35.52],
			[-74.4599, 35.52],
			[-74.4599, 35.5201],
			[-74.46, 35.52]
		]
	]
};

describe('migration 0006: estimate facets take the shared shape', () => {
	const db = openPglite();
	const target = journal.entries.findIndex((e) => e.tag === '0006_estimate-facet-geometry');

	beforeAll(async () => {
		expect(target).toBeGreaterThan(0);
		for (const e of journal.entries.slice(0, target)) await apply(db, e.tag);
		const [{ id: company }] = (
			await db.query<{ id: string }>(`INSERT INTO companies (name) VALUES ('Test') RETURNING id`)
		).rows;
		const [{ id: card }] = (
			await db.query<{ id: string }>(
				`INSERT INTO rate_cards (company_id, version, card) VALUES ($1, 1, '{}') RETURNING id`,
				[company]
			)
		).rows;
		const insert = (input: unknown) =>
			db.query(
				`INSERT INTO estimates (company_id, rate_card_id, rate_card_version, input, result, total_cents)
				 VALUES ($1, $2, 1, $3, '{}', 100)`,
				[company, card, JSON.stringify(input)]
			);
		await insert({
			facets: [
				{ id: 'a', label: 'South', polygon: outline, pitch: 6 },
				{ id: 'b', polygon: outline, pitch: 4, edges: [null, null, null] }
			],
			discountPct: 5
		});
		await insert({ facets: [{ id: 'c', geometry: outline, pitch: 8 }] });
		await insert({ facets: [] });
		await apply(db, journal.entries[target].tag);
	});
	afterAll(() => db.close());

	it('renames polygon to geometry in every facet, in order, keeping every other field', async () => {
		const rows = (
			await db.query<{ input: { facets: Record<string, unknown>[]; discountPct?: number } }>(
				`SELECT input FROM estimates ORDER BY total_cents, created_at`
			)
		).rows.map((r) => r.input);
		const old = rows.find((r) => r.discountPct === 5)!;
		expect(old.facets).toEqual([
			{ id: 'a', label: 'South', geometry: outline, pitch: 6 },
			{ id: 'b', geometry: outline, pitch: 4, edges: [null, null, null] }
		]);
		expect(rows.find((r) => r.facets[0]?.id === 'c')!.facets).toEqual([
			{ id: 'c', geometry: outline, pitch: 8 }
		]);
		expect(rows.some((r) => Array.isArray(r.facets) && r.facets.length === 0)).toBe(true);
		const left = await db.query(`SELECT 1 FROM estimates WHERE input::text LIKE '%"polygon"%'`);
		expect(left.rows).toHaveLength(0);
	});
});
