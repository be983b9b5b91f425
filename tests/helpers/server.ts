import { spawn, execFileSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';

export type TestServer = {
	url: string;
	port: number;
	dataDir: string;
	proc: ChildProcess;
	log: () => string;
	stop: () => Promise<void>;
};

export async function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const s = net.createServer();
		s.listen(0, '127.0.0.1', () => {
			const port = (s.address() as net.AddressInfo).port;
			s.close(() => resolve(port));
		});
		s.on('error', reject);
	});
}

/** A fresh data directory, migrated and seeded with the demo, for one test file. */
export function seededDataDir(name: string): string {
	const dir = path.resolve('tmp', 'data', `${name}-${process.pid}-${Date.now()}`);
	fs.mkdirSync(path.dirname(dir), { recursive: true });
	execFileSync('npx', ['tsx', 'scripts/seed-test.ts'], {
		env: { ...process.env, CLEARPITCH_DATA_DIR: dir, DATABASE_URL: '' },
		stdio: 'pipe'
	});
	return dir;
}

/**
 * Starts the built server (`build/`) on a free port against `dataDir` and waits until it
 * answers. Throws, with the server's log, if it exits first or is not up by the deadline.
 */
export async function startServer(
	dataDir: string,
	extraEnv: Record<string, string> = {},
	opts: { startTimeoutMs?: number } = {}
): Promise<TestServer> {
	if (!fs.existsSync('build/index.js')) throw new Error('Run `npm run build` before these tests.');
	const port = await freePort();
	let out = '';
	const proc = spawn(process.execPath, ['scripts/start.js'], {
		env: {
			...process.env,
			PORT: String(port),
			ORIGIN: `http://localhost:${port}`,
			CLEARPITCH_DATA_DIR: dataDir,
			DATABASE_URL: '',
			// Node closes an idle keep-alive socket after 5 s; a test client that reuses it at that
			// moment gets ECONNRESET. Outlast the clients' own idle time instead.
			KEEP_ALIVE_TIMEOUT: '65',
			// and the usual pairing: Node's headers timeout longer than the keep-alive one, so a socket
			// idle between requests is not cut at the 60 s headers deadline first (one fuzz case met an
			// ECONNRESET under load).
			HEADERS_TIMEOUT: '70',
			...extraEnv
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	proc.stdout!.on('data', (d) => (out += d));
	proc.stderr!.on('data', (d) => (out += d));
	const url = `http://localhost:${port}`;
	const stop = () =>
		new Promise<void>((resolve) => {
			if (proc.exitCode !== null || proc.signalCode !== null) return resolve();
			proc.once('exit', () => resolve());
			proc.kill('SIGTERM');
			setTimeout(() => proc.kill('SIGKILL'), 10_000).unref();
		});
	await waitUntilHealthy(url, proc, () => out, stop, opts.startTimeoutMs ?? 90_000);
	return {
		url,
		port,
		dataDir,
		proc,
		log: () => out,
		stop
	};
}

/** A server that did not come up; `proc` has exited by the time this is thrown. */
export class ServerStartError extends Error {
	constructor(
		message: string,
		readonly proc: ChildProcess
	) {
		super(message);
		this.name = 'ServerStartError';
	}
}

/** Resolves once the child has exited (at once if it already has). */
function exited(proc: ChildProcess): Promise<void> {
	if (proc.exitCode !== null || proc.signalCode !== null) return Promise.resolve();
	return new Promise((resolve) => proc.once('exit', () => resolve()));
}

/**
 * Polls /api/health until it answers 200. Throws, with the server's output, when the server
 * exits first or when the deadline passes (after stopping the server, so no process is left).
 */
async function waitUntilHealthy(
	url: string,
	proc: ChildProcess,
	log: () => string,
	stop: () => Promise<void>,
	timeoutMs: number
): Promise<void> {
	const deadline = Date.now() + timeoutMs;
	const died = exited(proc).then(() => 'exited' as const);
	for (;;) {
		if (proc.exitCode !== null || proc.signalCode !== null) {
			throw new ServerStartError(
				`Server exited early (code ${proc.exitCode}, signal ${proc.signalCode}):\n${log()}`,
				proc
			);
		}
		if (Date.now() >= deadline) {
			await stop();
			throw new ServerStartError(
				`Server did not answer ${url}/api/health within ${timeoutMs} ms:\n${log()}`,
				proc
			);
		}
		try {
			const r = await fetch(`${url}/api/health`, { signal: AbortSignal.timeout(5_000) });
			if (r.ok) return;
		} catch {
			/* not listening yet */
		}
		// Poll again after 200 ms, or at once if the server exits meanwhile.
		await Promise.race([died, new Promise((r) => setTimeout(r, 200))]);
	}
}

export const DEMO_PASSWORD = 'pitch-demo-2026';
export const DEMO = {
	owner: 'owner@harborpine.example',
	estimator: 'estimator@harborpine.example',
	sales: 'sales@harborpine.example',
	crew: 'crew@harborpine.example'
} as const;
