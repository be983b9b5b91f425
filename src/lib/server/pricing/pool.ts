import { Piscina } from 'piscina';
import { env } from '../env';
import type { PriceOutcome, PriceTask } from './price-request';

/**
 * Prices requests on worker threads. The main thread runs the framework and PGlite, which is
 * synchronous; parsing, validating, pricing and serializing a 30-facet roof is about half a
 * millisecond of CPU that would otherwise queue every other request behind it. Without
 * threads (one core, dev server, tests in-process) the same function runs in place.
 */

type Pricing = { pool: Piscina | null; inPlace: (task: PriceTask) => PriceOutcome };

let pricing: Promise<Pricing> | null = null;

async function open(): Promise<Pricing> {
	// One module is both the in-place function and, by its own address, the threads' entry.
	const entry = await import('./worker');
	const threads = env.pricingThreads;
	// Under Vite's dev server the entry is TypeScript, which a plain worker can't load.
	if (threads === 0 || !entry.workerUrl.endsWith('.js'))
		return { pool: null, inPlace: entry.default };
	try {
		const pool = new Piscina({
			filename: entry.workerUrl,
			minThreads: threads,
			maxThreads: threads,
			idleTimeout: Infinity,
			// Threads wait on messages rather than in Atomics.wait: measured no slower here, and a
			// thread blocked in Atomics.wait runs nothing else a module may have scheduled.
			atomics: 'disabled'
		});
		pool.on('error', (e) => console.error('A pricing thread failed:', e));
		// A thread that cannot load its entry fails here, at start-up, not on a customer's request.
		await pool.run({ body: new Uint8Array(0), card: null } satisfies PriceTask);
		return { pool, inPlace: entry.default };
	} catch (e) {
		console.error('Pricing threads could not start; pricing on the main thread.', e);
		return { pool: null, inPlace: entry.default };
	}
}

/** Starts the threads ahead of the first request. */
export async function startPricing(): Promise<void> {
	await (pricing ??= open());
}

export async function runPricing(task: PriceTask): Promise<PriceOutcome> {
	const { pool, inPlace } = await (pricing ??= open());
	return pool ? ((await pool.run(task)) as PriceOutcome) : inPlace(task);
}

export async function stopPricing(): Promise<void> {
	const p = pricing;
	pricing = null;
	await (await p)?.pool?.destroy();
}
