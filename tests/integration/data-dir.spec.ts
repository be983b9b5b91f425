// The embedded database: migrations on an empty directory, the one-process lock, seeding.
// Every slow step (scripts, seeding, server start-up) runs in a beforeAll, under the hook
// timeout, so a loaded two-core machine slows these tests down without failing them.
import { execFile } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import { openPglite } from '../helpers/pglite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn } from '../helpers/http';
import {
	DEMO,
	seededDataDir,
	ServerStartError,
	startServer,
	type TestServer
} from '../helpers/server';

const run = promisify(execFile);
const servers: TestServer[] = [];
afterAll(async () => {
	await Promise.all(servers.map((s) => s.stop()));
});

const TABLES = ['users', 'sites', 'customers', 'roof_plans', 'estimates'] as const;
type Counts = Record<(typeof TABLES)[number], number>;

/** Row counts of the demo tables, read in one opening while no process holds the directory. */
async function countAll(dir: string): Promise<Counts> {
	const db = openPglite(dir);
	try {
		await db.waitReady;
		const counts = {} as Counts;
		for (const t of TABLES) {
			const r = await db.query<{ n: number }>(`select count(*)::int as n from ${t}`);
			counts[t] = r.rows[0].n;
		}
		return counts;
	} finally {
		await db.close();
	}
}

describe('embedded PGlite data directory', () => {
	describe('an empty directory', () => {
		const dir = path.resolve('tmp/data', `empty-${process.pid}-${Date.now()}`);
		const env = { ...process.env, CLEARPITCH_DATA_DIR: dir, DATABASE_URL: '' };
		let existedBefore = true;
		let migrated = false;
		let first = '';
		let second = '';
		let afterFirst: Counts;
		let afterSecond: Counts;

		beforeAll(async () => {
			existedBefore = fs.existsSync(dir);
			await run('npx', ['tsx', 'scripts/migrate.ts'], { env });
			migrated = fs.existsSync(path.join(dir, 'PG_VERSION'));
			first = (await run('npx', ['tsx', 'scripts/seed.ts'], { env })).stdout;
			afterFirst = await countAll(dir);
			second = (await run('npx', ['tsx', 'scripts/seed.ts'], { env })).stdout;
			afterSecond = await countAll(dir);
		});

		it('is migrated', () => {
			expect(existedBefore).toBe(false);
			expect(migrated).toBe(true);
		});

		it('is seeded once with the demo', () => {
			// The four demo roles and a second technician for the week view.
			expect(first).toMatch(/5 users, \d+ sites/);
			expect(first).toMatch(/1 rate cards, 6 roof plans, 6 estimates/);
			expect(afterFirst.estimates).toBe(6);
			expect(afterFirst.roof_plans).toBe(6);
			expect(afterFirst.users).toBe(5);
			expect(afterFirst.sites).toBeGreaterThanOrEqual(12);
		});

		it('is not seeded twice', () => {
			expect(second).toMatch(/0 users, 0 sites, 0 rate cards, 0 roof plans, 0 estimates/);
			expect(afterSecond).toEqual(afterFirst);
		});
	});

	describe('the one-process lock', () => {
		let dir: string;
		let first: TestServer;
		let ownerCookie: string;

		beforeAll(async () => {
			dir = seededDataDir('lock');
			first = await startServer(dir);
			servers.push(first);
			const owner = await signIn(first.url, DEMO.owner);
			expect(owner.status).toBe(303);
			ownerCookie = owner.cookie!;
		});

		it('stops a second server on the same directory at once, and the first keeps its data', async () => {
			const started = Date.now();
			const second = await startServer(dir).then(
				(s) => {
					servers.push(s);
					return null;
				},
				(e: Error) => e
			);
			expect(second).toBeInstanceOf(Error);
			expect(second!.message).toMatch(/in use by another process/);
			// sysexits.h EX_TEMPFAIL: the hook's exit code while another server holds the data
			expect(second!.message).toMatch(/code 75\b/);
			expect(Date.now() - started).toBeLessThan(30_000);

			// The first server still answers and its data is intact.
			const res = await fetch(`${first.url}/api/team`, {
				headers: { cookie: ownerCookie, accept: 'application/json' }
			});
			expect(res.status).toBe(200);
			expect((await res.json()).members).toHaveLength(4);
		});

		it('refuses a script too while the server runs', async () => {
			const script = await run('npx', ['tsx', 'scripts/migrate.ts'], {
				env: { ...process.env, CLEARPITCH_DATA_DIR: dir, DATABASE_URL: '' }
			}).then(
				() => null,
				(e: Error & { stderr: string }) => e
			);
			expect(script?.stderr).toMatch(/in use by another process/);
		});
	});

	describe('the start-up helper', () => {
		it('throws at its deadline and leaves no server running', async () => {
			const dir = path.resolve('tmp/data', `deadline-${process.pid}-${Date.now()}`);
			const err = await startServer(dir, {}, { startTimeoutMs: 1 }).then(
				(s) => {
					servers.push(s);
					return null;
				},
				(e: unknown) => e
			);
			expect(err).toBeInstanceOf(ServerStartError);
			const e = err as ServerStartError;
			expect(e.message).toMatch(/did not answer .*\/api\/health within 1 ms/);
			// (The log in the message is checked above: the lock refusal is the server's own output.)
			expect(e.proc.exitCode !== null || e.proc.signalCode !== null).toBe(true);
		});
	});

	describe('a restart', () => {
		let dir: string;
		let a: TestServer;

		beforeAll(async () => {
			dir = seededDataDir('restart');
			a = await startServer(dir);
			servers.push(a);
		});

		// The reopening is the thing tested, so one server start runs inside the test: its
		// timeout is the hook's, above the start-up helper's own deadline.
		it(
			'closes cleanly on SIGTERM and reopens the same directory',
			{ timeout: 180_000 },
			async () => {
				await a.stop();
				expect(a.proc.exitCode === 0 || a.proc.signalCode === 'SIGTERM').toBe(true);
				const b = await startServer(dir);
				servers.push(b);
				expect((await signIn(b.url, DEMO.sales)).status).toBe(303);
			}
		);
	});
});
