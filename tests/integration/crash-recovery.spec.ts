// Crash safety of the embedded database: 50 times, the built server is killed with SIGKILL at a
// random moment while several clients write through the API, then started again. Every write the
// server acknowledged (a 201 for a saved estimate, a 200 for a status change) must be there after
// the restart, and the data directory must open. 0 lost.
//
// What this covers, and what it does not. PGlite runs Postgres in one process with fsync off
// (`-F` among its start-up flags) and its Node file system does not sync to disk, so a COMMIT that
// has returned sits in the operating system's page cache (electric-sql/pglite#1107, #1065; see
// /work/shared/RELIABILITY.md §1). A process kill leaves the page cache alone, so Postgres' WAL
// replay at the next start must bring back every committed transaction: that is what is tested
// here. An OS crash or a power loss can lose the last commits, and nothing here claims otherwise;
// deployments that need that guarantee run on PostgreSQL (DATABASE_URL).
//
// The kill moments come from a seeded generator; the seed is printed, and
// CLEARPITCH_CRASH_SEED=<seed> replays the same schedule.
import fs from 'node:fs';
import { openPglite } from '../helpers/pglite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { prepareDataDir, sceneRequest, type SeededSite } from './api-helpers';
import { seededDataDir, startServer, type TestServer } from '../helpers/server';
import { mulberry32 } from '../../geodata/prng.js';

const ROUNDS = 50;
const CLIENTS = 4;
/** The kill falls this long after the writes start: from almost at once to well into the stream. */
const KILL_AFTER_MS = { min: 5, max: 1200 };

const SEED = Number(process.env.CLEARPITCH_CRASH_SEED ?? Math.floor(Math.random() * 2 ** 32));

type Acked = { status: 'draft' | 'ready'; patchSent: boolean; round: number };

let dir: string;
let token: string;
let sites: SeededSite[];
let server: TestServer | undefined;

beforeAll(async () => {
	dir = seededDataDir('crash');
	const prepared = await prepareDataDir(dir);
	token = prepared.ownerToken;
	sites = prepared.sites.filter((s) => s.houseId);
	expect(sites.length).toBeGreaterThan(0);
});

afterAll(async () => {
	// SIGKILL, not stop(): a server already killed never sends another exit event.
	if (server) await kill(server);
});

const headers = () => ({ authorization: `Bearer ${token}`, 'content-type': 'application/json' });

/** One client: saves estimates and moves some to ready until told to stop (or the server dies). */
async function writer(
	url: string,
	rand: () => number,
	acked: Map<string, Acked>,
	round: number,
	stopped: () => boolean
) {
	while (!stopped()) {
		try {
			const site = sites[Math.floor(rand() * sites.length)];
			const r = await fetch(`${url}/api/estimates`, {
				method: 'POST',
				headers: headers(),
				body: JSON.stringify({ ...sceneRequest(site.houseId!), siteId: site.id, save: true }),
				signal: AbortSignal.timeout(15_000)
			});
			if (r.status !== 201) {
				await r.body?.cancel();
				if (!stopped()) throw new Error(`POST /api/estimates answered ${r.status}`);
				return;
			}
			const id = ((await r.json()) as { estimate: { id: string } }).estimate.id;
			acked.set(id, { status: 'draft', patchSent: false, round });
			if (rand() < 0.3) {
				acked.get(id)!.patchSent = true;
				const p = await fetch(`${url}/api/estimates/${id}`, {
					method: 'PATCH',
					headers: headers(),
					body: JSON.stringify({ status: 'ready' }),
					signal: AbortSignal.timeout(15_000)
				});
				await p.body?.cancel();
				if (p.status === 200) acked.get(id)!.status = 'ready';
				else if (!stopped()) throw new Error(`PATCH /api/estimates/${id} answered ${p.status}`);
			}
		} catch (e) {
			// A refused or reset connection after the kill is the point of the test, not a failure.
			if (stopped()) return;
			throw e;
		}
	}
}

/** Acknowledged writes the database does not have, or has with a status older than acknowledged. */
function missing(
	acked: Map<string, Acked>,
	stored: Map<string, string>,
	only?: (a: Acked) => boolean
): string[] {
	const out: string[] = [];
	for (const [id, a] of acked) {
		if (only && !only(a)) continue;
		const s = stored.get(id);
		// A status change sent but cut off before its answer may or may not have landed.
		const ok = s === a.status || (a.patchSent && a.status === 'draft' && s === 'ready');
		if (!ok)
			out.push(`${id} (round ${a.round}: acknowledged ${a.status}, stored ${s ?? 'nothing'})`);
	}
	return out;
}

async function storedOverApi(url: string, ids: string[]): Promise<Map<string, string>> {
	const out = new Map<string, string>();
	for (const id of ids) {
		const r = await fetch(`${url}/api/estimates/${id}`, { headers: headers() });
		if (r.status === 200) out.set(id, ((await r.json()) as { status: string }).status);
		else await r.body?.cancel();
	}
	return out;
}

function kill(s: TestServer): Promise<void> {
	return new Promise((resolve) => {
		if (s.proc.exitCode !== null || s.proc.signalCode !== null) return resolve();
		s.proc.once('exit', () => resolve());
		s.proc.kill('SIGKILL');
	});
}

describe('SIGKILL during a stream of API writes', () => {
	it(
		`loses no acknowledged write in ${ROUNDS} kills, and restarts at once on the stale lock`,
		async () => {
			console.log(`crash-recovery seed ${SEED} (CLEARPITCH_CRASH_SEED=${SEED} replays it)`);
			const rand = mulberry32(SEED);
			const acked = new Map<string, Acked>();
			const startMs: number[] = [];
			const lost: string[] = [];
			const began = Date.now();

			for (let round = 0; round < ROUNDS; round++) {
				const t0 = Date.now();
				server = await startServer(dir, { CLEARPITCH_PRICING_THREADS: '0' });
				// The helper gives up quietly at its deadline; the server must really answer.
				const health = await fetch(`${server.url}/api/health`).catch(() => null);
				expect(health?.status, `round ${round}: no answer after restart\n${server.log()}`).toBe(
					200
				);
				startMs.push(Date.now() - t0);

				// The previous round's acknowledged writes, read back through the restarted server.
				const before = [...acked].filter(([, a]) => a.round === round - 1).map(([id]) => id);
				const back = missing(
					acked,
					await storedOverApi(server.url, before),
					(a) => a.round === round - 1
				);
				lost.push(...back);
				expect(back, `seed ${SEED}, after kill ${round}`).toEqual([]);

				let stop = false;
				const clients = Array.from({ length: CLIENTS }, () =>
					writer(server!.url, rand, acked, round, () => stop)
				);
				const wait = KILL_AFTER_MS.min + rand() * (KILL_AFTER_MS.max - KILL_AFTER_MS.min);
				await new Promise((r) => setTimeout(r, wait));
				stop = true;
				await kill(server);
				await Promise.all(clients);
				// proper-lockfile's lock directory is left behind with a fresh mtime: the next start
				// must take it over, not wait out its 10 s staleness.
				expect(fs.existsSync(`${dir}.lock`), `round ${round}: the kill left no lock`).toBe(true);
			}

			// The last round's writes, and every write of every round, read from the directory itself.
			server = undefined;
			const db = openPglite(dir);
			let stored: Map<string, string>;
			try {
				await db.waitReady;
				const r = await db.query<{ id: string; status: string }>(
					'select id, status from estimates'
				);
				stored = new Map(r.rows.map((row) => [row.id, row.status]));
			} finally {
				await db.close();
			}
			lost.push(...missing(acked, stored));

			const sorted = [...startMs].sort((a, b) => a - b);
			console.log(
				`crash-recovery: ${ROUNDS} kills, ${acked.size} acknowledged writes, ` +
					`${[...acked.values()].filter((a) => a.status === 'ready').length} acknowledged status changes, ` +
					`${lost.length} lost; start-up median ${sorted[Math.floor(sorted.length / 2)]} ms, ` +
					`max ${sorted[sorted.length - 1]} ms; ${((Date.now() - began) / 1000).toFixed(0)} s in all`
			);
			expect(lost, `seed ${SEED}`).toEqual([]);
			// Enough writes got through for the count to mean something.
			expect(acked.size).toBeGreaterThan(ROUNDS);
		},
		20 * 60_000
	);
});
