/**
 * Model benchmark: prices a 30-facet roof over and over and reports estimates per second.
 * Run directly with `npx tsx bench/model.ts`, or import benchModel() from a bench runner.
 */
import { performance } from 'node:perf_hooks';
import { pathToFileURL } from 'node:url';
import type { Polygon } from 'geojson';
import {
	DEFAULT_RATE_CARD,
	estimate,
	type EdgeKind,
	type EstimateInput,
	type FacetInput,
	type RateCard
} from '../src/lib/estimating';
import { meridionalRadius, primeVerticalRadius } from '../src/lib/estimating/geometry';

const DEG = Math.PI / 180;
const M_PER_FT = 0.3048;

/** Invented roof in the invented town of Wrenfield (coordinates arbitrary). */
export function benchRoof(facetCount = 30, lat0 = 44.9, lon0 = -93.1): EstimateInput {
	const m = meridionalRadius(lat0);
	const n = primeVerticalRadius(lat0);
	const toLonLat = (xFt: number, yFt: number): [number, number] => [
		lon0 + (xFt * M_PER_FT) / (n * Math.cos(lat0 * DEG)) / DEG,
		lat0 + (yFt * M_PER_FT) / m / DEG
	];
	const materials = ['asphalt_shingle', 'asphalt_shingle', 'metal', 'clay_tile', 'slate'] as const;
	const growth = ['G0', 'G1', 'G2', 'G3', 'G4'] as const;
	const access = ['ground', 'ladder', 'lift', 'ladder'] as const;
	const facets: FacetInput[] = [];
	for (let i = 0; i < facetCount; i++) {
		const x = (i % 6) * 50;
		const y = Math.floor(i / 6) * 40;
		const w = 20 + (i % 4) * 6;
		const h = 12 + (i % 3) * 5;
		// alternate gable rectangles, hip trapezoids and hip-end triangles
		const shape = i % 3;
		const inset = Math.min(h, w / 3);
		const corners: Array<[number, number]> =
			shape === 0
				? [
						[x, y],
						[x + w, y],
						[x + w, y + h],
						[x, y + h]
					]
				: shape === 1
					? [
							[x, y],
							[x + w, y],
							[x + w - inset, y + h],
							[x + inset, y + h]
						]
					: [
							[x, y],
							[x + w, y],
							[x + w / 2, y + h]
						];
		const ring = corners.map(([cx, cy]) => toLonLat(cx, cy));
		ring.push(ring[0]);
		const polygon: Polygon = { type: 'Polygon', coordinates: [ring] };
		const edges: Array<EdgeKind | null> | undefined =
			i % 2 === 0
				? shape === 0
					? ['eave', 'rake', 'ridge', 'rake']
					: shape === 1
						? ['eave', 'hip', 'ridge', 'hip']
						: ['eave', 'hip', 'hip']
				: undefined;
		facets.push({
			id: `f${i + 1}`,
			label: `Facet ${i + 1}`,
			geometry: polygon,
			pitch: 3 + (i % 8) * 1.5,
			material: materials[i % materials.length],
			growth: growth[i % growth.length],
			access: access[i % access.length],
			stories: (1 + (i % 3)) as 1 | 2 | 3,
			...(edges ? { edges } : {})
		});
	}
	return {
		facets,
		testSpot: { strengthPct: 4, secondsToColourChange: 70, rinsedClean: true },
		extras: [{ label: 'Gutter flush', priceCents: 12000 }],
		discountPct: 5,
		siteFlags: { noGutters: false, plantsToProtect: true }
	};
}

export interface ModelBench {
	/** Median over the timed windows: the machine is shared, so one window can be unlucky. */
	estimatesPerSec: number;
	minPerSec: number;
	maxPerSec: number;
	/** Estimates per second of this process's CPU time: what the model costs, whatever else runs. */
	estimatesPerCpuSec: number;
	facets: number;
	iterations: number;
	elapsedMs: number;
	usPerEstimate: number;
	totalCents: number;
}

export async function benchModel(
	opts: { durationMs?: number; windows?: number; facetCount?: number; rateCard?: RateCard } = {}
): Promise<ModelBench> {
	const durationMs = opts.durationMs ?? 3000;
	const windows = opts.windows ?? 7;
	const card = opts.rateCard ?? DEFAULT_RATE_CARD;
	const input = benchRoof(opts.facetCount ?? 30);
	let totalCents = 0;
	// Warm-up so the JIT has compiled the hot paths before timing.
	const warmUntil = performance.now() + Math.min(500, durationMs / 4);
	while (performance.now() < warmUntil) totalCents = estimate(input, card).price.totalCents;

	const rates: number[] = [];
	let iterations = 0;
	let elapsedMs = 0;
	const cpuStart = process.cpuUsage();
	for (let w = 0; w < windows; w++) {
		let n = 0;
		const start = performance.now();
		const end = start + durationMs / windows;
		let now = start;
		while (now < end) {
			for (let k = 0; k < 100; k++) totalCents = estimate(input, card).price.totalCents;
			n += 100;
			now = performance.now();
		}
		rates.push((n * 1000) / (now - start));
		iterations += n;
		elapsedMs += now - start;
	}
	const cpu = process.cpuUsage(cpuStart);
	rates.sort((a, b) => a - b);
	const median = rates[Math.floor(rates.length / 2)];
	return {
		estimatesPerSec: median,
		minPerSec: rates[0],
		maxPerSec: rates[rates.length - 1],
		estimatesPerCpuSec: (iterations * 1e6) / (cpu.user + cpu.system),
		facets: input.facets.length,
		iterations,
		elapsedMs,
		usPerEstimate: 1e6 / median,
		totalCents
	};
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
	void benchModel().then((r) => {
		const n = (x: number) => Math.round(x).toLocaleString('en-US');
		console.log(
			`model: ${n(r.estimatesPerSec)} estimates/s median (min ${n(r.minPerSec)}, max ${n(r.maxPerSec)}; ` +
				`${n(r.estimatesPerCpuSec)} per CPU-second; ` +
				`${r.facets} facets, ${r.usPerEstimate.toFixed(1)} µs each, ${r.iterations} runs in ${Math.round(r.elapsedMs)} ms; target ≥ 20,000/s)`
		);
	});
}
