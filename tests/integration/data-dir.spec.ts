// The embedded database: migrations on an empty directory, the one-process lock, seeding.
import { execFile } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, describe, expect, it } from 'vitest';
import { signIn } from '../helpers/http';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';

const run = promisify(execFile);
const servers: TestServer[] = [];
afterAll(async () => {
	await Promise.all(servers.map((s) => s.stop()));
});

async function countRows(dir: string, table: string) {
	const { stdout } = await run('npx', ['tsx', 'scripts/count-rows.ts', table], {
		env: { ...process.env, CLEARPITCH_DATA_DIR: dir, DATABASE_URL: '' }
	});
	return Number(stdout.trim().split('\n').pop());
}

describe('embedded PGlite data directory', () => {
	it('migrates an empty directory and seeds idempotently', async () => {
		const dir = path.resolve('tmp/data', `empty-${process.pid}-${Date.now()}`);
		expect(fs.existsSync(dir)).toBe(false);
		const env = { ...process.env, CLEARPITCH_DATA_DIR: dir, DATABASE_URL: '' };
		await run('npx', ['tsx', 'scripts/migrate.ts'], { env });
		expect(fs.existsSync(path.join(dir, 'PG_VERSION'))).toBe(true);
		const first = await run('npx', ['tsx', 'scripts/seed.ts'], { env });
		expect(first.stdout).toMatch(/4 users, \d+ sites/);
		const before = {
			users: await countRows(dir, 'users'),
			sites: await countRows(dir, 'sites'),
			customers: await countRows(dir, 'customers'),
			roofPlans: await countRows(dir, 'roof_plans'),
			estimates: await countRows(dir, 'estimates')
		};
		expect(first.stdout).toMatch(/1 rate cards, 6 roof plans, 6 estimates/);
		expect(before.estimates).toBe(6);
		expect(before.users).toBe(4);
		expect(before.sites).toBeGreaterThanOrEqual(12);
		const second = await run('npx', ['tsx', 'scripts/seed.ts'], { env });
		expect(second.stdout).toMatch(/0 users, 0 sites, 0 rate cards, 0 roof plans, 0 estimates/);
		expect(await countRows(dir, 'users')).toBe(before.users);
		expect(await countRows(dir, 'sites')).toBe(before.sites);
		expect(await countRows(dir, 'customers')).toBe(before.customers);
		expect(await countRows(dir, 'roof_plans')).toBe(before.roofPlans);
		expect(await countRows(dir, 'estimates')).toBe(before.estimates);
	});

	it('fails a second server on the same directory fast, and the first keeps its data', async () => {
		const dir = seededDataDir('lock');
		const first = await startServer(dir);
		servers.push(first);
		const owner = await signIn(first.url, DEMO.owner);
		expect(owner.status).toBe(303);

		const started = Date.now();
		const second = await startServer(dir).then(
			() => null,
			(e: Error) => e
		);
		expect(second).toBeInstanceOf(Error);
		expect(second!.message).toMatch(/in use by another process/);
		expect(Date.now() - started).toBeLessThan(30_000);

		// The first server still answers and its data is intact.
		const res = await fetch(`${first.url}/api/team`, {
			headers: { cookie: owner.cookie!, accept: 'application/json' }
		});
		expect(res.status).toBe(200);
		expect((await res.json()).members).toHaveLength(4);
		// A script is refused too while the server runs.
		const script = await run('npx', ['tsx', 'scripts/migrate.ts'], {
			env: { ...process.env, CLEARPITCH_DATA_DIR: dir, DATABASE_URL: '' }
		}).then(
			() => null,
			(e: Error & { stderr: string }) => e
		);
		expect(script?.stderr).toMatch(/in use by another process/);
	});

	it('closes cleanly on SIGTERM and reopens the same directory', async () => {
		const dir = seededDataDir('restart');
		const a = await startServer(dir);
		await a.stop();
		expect(a.proc.exitCode === 0 || a.proc.signalCode === 'SIGTERM').toBe(true);
		const b = await startServer(dir);
		servers.push(b);
		expect((await signIn(b.url, DEMO.sales)).status).toBe(303);
	});
});
