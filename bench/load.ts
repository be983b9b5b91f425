/**
 * Load and scale benchmarks on the built server:
 * - mixed load: 50 connections for 60 s cycling through a page, two lists, a site search and
 *   POST /api/estimates (one in four saved), counting every non-2xx, error and timeout;
 * - large lists: the Sites page, a site search and GET /api/estimates on the demo data and on the
 *   demo plus 10,000 sites and 20,000 estimates over 100 sites (bench/seed-big.ts), same run, so
 *   the figure is the ratio big ÷ small.
 */
import { execFileSync } from 'node:child_process';
import { prepareDataDir } from '../tests/integration/api-helpers';
import { sessionFor } from '../tests/helpers/http';
import { seededDataDir } from '../tests/helpers/server';
import { quantile, run, startSnapshotServer } from './api';
import { benchRoof } from './model';

export interface MixedLoad {
	connections: number;
	seconds: number;
	requests: number;
	reqPerSec: number;
	errors: number;
	medianMs: number;
	p99Ms: number;
}

export async function benchMixed(
	opts: { connections?: number; seconds?: number } = {}
): Promise<MixedLoad> {
	const connections = opts.connections ?? 50;
	const seconds = opts.seconds ?? 60;
	const dir = seededDataDir('bench-mixed');
	const { ownerToken, sites } = await prepareDataDir(dir);
	const server = await startSnapshotServer(dir);
	try {
		const cookie = await sessionFor(server.url, 'sales');
		const bearer = { authorization: `Bearer ${ownerToken}` };
		const json = { ...bearer, 'content-type': 'application/json' };
		const roof = benchRoof(30);
		const siteId = sites[0].id;
		const requests = [
			{ method: 'GET', path: '/sites', headers: { cookie, accept: 'text/html' } },
			{ method: 'GET', path: '/api/estimates?pageSize=25', headers: bearer },
			{ method: 'POST', path: '/api/estimates', headers: json, body: JSON.stringify(roof) },
			{ method: 'GET', path: '/api/sites?q=Wrenfield', headers: bearer },
			{ method: 'GET', path: '/estimates', headers: { cookie, accept: 'text/html' } },
			{
				method: 'POST',
				path: '/api/estimates',
				headers: json,
				body: JSON.stringify({ ...roof, siteId, save: true })
			},
			{ method: 'POST', path: '/api/estimates', headers: json, body: JSON.stringify(roof) },
			{ method: 'GET', path: `/sites/${siteId}`, headers: { cookie, accept: 'text/html' } }
		];
		// Each request must answer 2xx on its own before the load, or errors would be the figure.
		for (const r of requests) {
			const res = await fetch(server.url + r.path, { ...r, redirect: 'manual' });
			if (res.status >= 300) throw new Error(`${r.method} ${r.path} answered ${res.status}`);
		}
		const times: number[] = [];
		const res = await run(
			{ url: server.url, connections, duration: seconds, requests, timeout: 30 },
			times
		);
		times.sort((a, b) => a - b);
		return {
			connections,
			seconds,
			requests: times.length,
			reqPerSec: times.length / seconds,
			errors: res.non2xx + res.errors + res.timeouts,
			medianMs: quantile(times, 0.5),
			p99Ms: quantile(times, 0.99)
		};
	} finally {
		await server.stop();
	}
}

export interface ListTimings {
	name: string;
	smallMs: number;
	bigMs: number;
	/** For a search: how many sites it finds in each data set. */
	matches?: { small: number; big: number };
}

/**
 * Two searches: one that finds the same few demo sites in both data sets (it must not read the
 * other 10,000), and one that finds none of the demo's but 500 of the big set's (it must count
 * them through the trigram index, not by reading every address).
 */
const SEARCHES = ['Tidewater', 'Heron'] as const;

export interface ListBench {
	lists: ListTimings[];
	bigSites: number;
	bigEstimates: number;
}

/** Median of `n` sequential requests after two warm-ups: the time one user waits for the page. */
async function median(url: string, headers: Record<string, string>, n = 40): Promise<number> {
	const out: number[] = [];
	for (let i = 0; i < n + 2; i++) {
		const t = performance.now();
		const res = await fetch(url, { headers, redirect: 'manual' });
		await res.arrayBuffer();
		if (res.status !== 200) throw new Error(`${url} answered ${res.status}`);
		if (i >= 2) out.push(performance.now() - t);
	}
	return quantile(
		out.sort((a, b) => a - b),
		0.5
	);
}

async function timeLists(dir: string) {
	const { ownerToken } = await prepareDataDir(dir);
	const server = await startSnapshotServer(dir);
	try {
		const cookie = await sessionFor(server.url, 'owner');
		const page = { cookie, accept: 'text/html' };
		const bearer = { authorization: `Bearer ${ownerToken}` };
		const counts = (await (
			await fetch(`${server.url}/api/estimates?pageSize=1`, { headers: bearer })
		).json()) as {
			total: number;
		};
		const timings: Record<string, { ms: number; matches?: number }> = {
			'Sites page': { ms: await median(`${server.url}/sites`, page) }
		};
		for (const q of SEARCHES) {
			const found = (await (
				await fetch(`${server.url}/api/sites?q=${q}&pageSize=1`, { headers: bearer })
			).json()) as { total: number };
			timings[`Sites page, search "${q}"`] = {
				ms: await median(`${server.url}/sites?q=${q}`, page),
				matches: found.total
			};
			timings[`GET /api/sites?q=${q}`] = {
				ms: await median(`${server.url}/api/sites?q=${q}`, bearer),
				matches: found.total
			};
		}
		timings['GET /api/estimates (first page)'] = {
			ms: await median(`${server.url}/api/estimates`, bearer)
		};
		timings['Estimates page'] = { ms: await median(`${server.url}/estimates`, page) };
		return { total: counts.total, timings };
	} finally {
		await server.stop();
	}
}

function seedBig(dir: string, demoOnly: boolean) {
	execFileSync('npx', ['tsx', 'bench/seed-big.ts', ...(demoOnly ? ['--demo-only'] : [])], {
		env: { ...process.env, CLEARPITCH_DATA_DIR: dir, DATABASE_URL: '' },
		stdio: 'pipe'
	});
}

export async function benchLists(): Promise<ListBench> {
	const small = seededDataDir('bench-small');
	seedBig(small, true);
	const big = seededDataDir('bench-big');
	seedBig(big, false);
	const a = await timeLists(small);
	const b = await timeLists(big);
	if (b.total < a.total + 20_000) throw new Error(`the big data set has ${b.total} estimates`);
	return {
		lists: Object.entries(a.timings).map(([name, t]) => ({
			name,
			smallMs: t.ms,
			bigMs: b.timings[name].ms,
			...(t.matches === undefined
				? {}
				: { matches: { small: t.matches, big: b.timings[name].matches ?? 0 } })
		})),
		bigSites: 10_000,
		bigEstimates: 20_000
	};
}
