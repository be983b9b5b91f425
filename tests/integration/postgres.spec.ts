// The same schema and migrations on a real PostgreSQL server (Debian's postgresql package).
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn } from '../helpers/http';
import { startPostgres, type TempPostgres } from '../helpers/postgres';
import { DEMO, startServer, type TestServer } from '../helpers/server';

const run = promisify(execFile);
let pgServer: TempPostgres;
let app: TestServer | undefined;

beforeAll(async () => {
	pgServer = await startPostgres();
});
afterAll(async () => {
	await app?.stop();
	pgServer?.stop();
});

describe('PostgreSQL through DATABASE_URL', () => {
	it('applies the committed migrations and seeds idempotently', async () => {
		const env = { ...process.env, DATABASE_URL: pgServer.url };
		const m = await run('npx', ['tsx', 'scripts/migrate.ts'], { env });
		expect(m.stdout).toMatch(/Migrations applied \(PostgreSQL\)/);
		await run('npx', ['tsx', 'scripts/seed.ts'], { env });
		const again = await run('npx', ['tsx', 'scripts/seed.ts'], { env });
		expect(again.stdout).toMatch(/0 users, 0 sites, 0 rate cards, 0 roof plans, 0 estimates/);

		const client = new pg.Client({ connectionString: pgServer.url });
		await client.connect();
		try {
			const tables = await client.query(
				"select table_name from information_schema.tables where table_schema = 'public' order by 1"
			);
			expect(tables.rows.map((r) => r.table_name)).toEqual(
				expect.arrayContaining([
					'companies',
					'users',
					'sessions',
					'customers',
					'sites',
					'rate_cards',
					'estimates',
					'roof_plans',
					'api_tokens'
				])
			);
			const cols = await client.query(
				"select table_name from information_schema.columns where column_name = 'company_id' and table_schema = 'public'"
			);
			expect(new Set(cols.rows.map((r) => r.table_name)).size).toBeGreaterThanOrEqual(8);
			const users = await client.query('select email, role from users order by email');
			// The four demo roles and the second technician the samples add for the week view.
			expect(users.rows).toHaveLength(5);
			const migrations = await client.query(
				'select count(*)::int as n from drizzle.__drizzle_migrations'
			);
			expect(migrations.rows[0].n).toBeGreaterThanOrEqual(1);
		} finally {
			await client.end();
		}
	});

	it('serves sign-in from the built server on PostgreSQL', async () => {
		app = await startServer('/nonexistent-unused', { DATABASE_URL: pgServer.url });
		const r = await signIn(app.url, DEMO.owner);
		expect(r.status).toBe(303);
		const res = await fetch(`${app.url}/api/team`, {
			headers: { cookie: r.cookie!, accept: 'application/json' }
		});
		expect((await res.json()).members).toHaveLength(5);
	});
});
