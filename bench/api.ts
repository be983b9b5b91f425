/**
 * API benchmark: POST /api/estimates with a 30-facet roof against the empty POST /api/health on
 * the same built server, same run, same body, same API token, 10 connections (autocannon).
 * Latencies come from every response autocannon reports, not from its 1 ms histogram buckets.
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { prepareDataDir } from '../tests/integration/api-helpers';
import { freePort, seededDataDir } from '../tests/helpers/server';
import { env } from '../src/lib/server/env';
import { benchRoof } from './model';

const require = createRequire(import.meta.url);

type Instance = {
	on(
		event: 'response',
		fn: (client: unknown, status: number, bytes: number, ms: number) => void
	): void;
};
type Result = { requests: { average: number }; non2xx: number; errors: number; timeouts: number };
const autocannon = require('autocannon') as (
	opts: Record<string, unknown>,
	done: (err: Error | null, result: Result) => void
) => Instance;

export interface EndpointStats {
	path: string;
	requests: number;
	reqPerSec: number;
	medianMs: number;
	p99Ms: number;
}

export interface ApiBench {
	health: EndpointStats;
	estimates: EndpointStats;
	bodyBytes: number;
	connections: number;
	secondsEach: number;
	rounds: number;
	pricingThreads: number;
}

export function quantile(sorted: number[], q: number): number {
	if (sorted.length === 0) return NaN;
	const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
	return sorted[i];
}

export function run(opts: Record<string, unknown>, times?: number[]): Promise<Result> {
	return new Promise((resolve, reject) => {
		const inst = autocannon(opts, (err, res) => (err ? reject(err) : resolve(res)));
		if (times) inst.on('response', (_c, status, _b, ms) => status < 300 && times.push(ms));
	});
}

/**
 * Runs a private copy of build/, so a rebuild in the shared tree during the run can't swap the
 * server's files underneath it.
 */
export async function startSnapshotServer(dataDir: string) {
	if (!fs.existsSync('build/index.js')) throw new Error('Run `npx vite build` before the bench.');
	const snapshot = path.resolve('tmp', `bench-build-${process.pid}`);
	fs.rmSync(snapshot, { recursive: true, force: true });
	fs.cpSync('build', snapshot, { recursive: true });
	const port = await freePort();
	const url = `http://localhost:${port}`;
	let log = '';
	const proc = spawn(process.execPath, [path.join(snapshot, 'index.js')], {
		env: {
			...process.env,
			PORT: String(port),
			ORIGIN: url,
			CLEARPITCH_DATA_DIR: dataDir,
			DATABASE_URL: ''
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	proc.stdout.on('data', (d) => (log += d));
	proc.stderr.on('data', (d) => (log += d));
	const deadline = Date.now() + 60_000;
	for (;;) {
		if (proc.exitCode !== null) throw new Error(`The server exited:\n${log}`);
		if (Date.now() > deadline) throw new Error(`The server did not start:\n${log}`);
		try {
			if ((await fetch(`${url}/api/health`)).ok) break;
		} catch {
			/* not listening yet */
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	return {
		url,
		log: () => log,
		stop: () =>
			new Promise<void>((resolve) => {
				const done = () => {
					fs.rmSync(snapshot, { recursive: true, force: true });
					resolve();
				};
				if (proc.exitCode !== null) return done();
				proc.once('exit', done);
				proc.kill('SIGTERM');
				setTimeout(() => proc.kill('SIGKILL'), 10_000).unref();
			})
	};
}

export async function benchApi(
	opts: { secondsEach?: number; rounds?: number; connections?: number } = {}
): Promise<ApiBench> {
	// Many short rounds rather than a few long ones: load from other work on a shared machine
	// then falls on both endpoints alike.
	const secondsEach = opts.secondsEach ?? 2;
	const rounds = opts.rounds ?? 8;
	const connections = opts.connections ?? 10;

	const dir = seededDataDir('bench');
	const { ownerToken } = await prepareDataDir(dir);
	const server = await startSnapshotServer(dir);
	const body = JSON.stringify(benchRoof(30));
	const common = {
		method: 'POST',
		connections,
		headers: { authorization: `Bearer ${ownerToken}`, 'content-type': 'application/json' },
		body
	};
	try {
		// The endpoint must price, not refuse: a 4xx is faster and would flatter the ratio.
		const probe = await fetch(`${server.url}/api/estimates`, {
			...common,
			headers: common.headers
		});
		if (probe.status !== 200) throw new Error(`POST /api/estimates answered ${probe.status}`);
		const priced = (await probe.json()) as { facets: unknown[] };
		if (priced.facets.length !== 30) throw new Error('the bench roof did not price 30 facets');

		const paths = { health: '/api/health', estimates: '/api/estimates' } as const;
		for (const path of Object.values(paths)) {
			await run({ ...common, url: server.url + path, duration: 3 });
		}
		const times = { health: [] as number[], estimates: [] as number[] };
		const seconds = { health: 0, estimates: 0 };
		// Alternate the two so drift (GC, the PGlite heap) falls on both alike.
		for (let r = 0; r < rounds; r++) {
			for (const key of ['health', 'estimates'] as const) {
				const res = await run(
					{ ...common, url: server.url + paths[key], duration: secondsEach },
					times[key]
				);
				if (res.non2xx || res.errors || res.timeouts) {
					throw new Error(
						`${paths[key]}: ${res.non2xx} non-2xx, ${res.errors} errors, ${res.timeouts} timeouts`
					);
				}
				seconds[key] += secondsEach;
			}
		}
		const stats = (key: 'health' | 'estimates'): EndpointStats => {
			const sorted = times[key].sort((a, b) => a - b);
			return {
				path: paths[key],
				requests: sorted.length,
				reqPerSec: sorted.length / seconds[key],
				medianMs: quantile(sorted, 0.5),
				p99Ms: quantile(sorted, 0.99)
			};
		};
		return {
			health: stats('health'),
			estimates: stats('estimates'),
			bodyBytes: Buffer.byteLength(body),
			connections,
			secondsEach: secondsEach * rounds,
			rounds,
			pricingThreads: env.pricingThreads
		};
	} finally {
		await server.stop();
	}
}
