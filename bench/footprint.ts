/**
 * Roof from outline: time from the outline's last corner to its facets, in the module alone
 * (squaring, the straight skeleton, gable ends, edge names), for 4-, 8- and 12-corner outlines.
 * The slowest run mostly measures a garbage collection or another process on the machine, so the
 * target is judged on the 95th percentile.
 * Run directly with `npx tsx bench/footprint.ts`, or import benchFootprint() from a bench runner.
 */
import { performance } from 'node:perf_hooks';
import { pathToFileURL } from 'node:url';
import type { Position } from 'geojson';
import { localPlane } from '../src/lib/estimating/local-plane';
import { roofFromOutline, type OutlineChoices } from '../src/lib/map/roof-outline';

export const FOOTPRINT_TARGET_MS = 100;

/** Invented outlines in metres, placed in the invented Wrenfield scene's open-sea plane. */
const SHAPES: Array<{
	name: string;
	pts: Array<[number, number]>;
	choices: Partial<OutlineChoices>;
}> = [
	{
		name: '4 corners, gable',
		pts: [
			[-7, -5],
			[7, -5],
			[7, 5],
			[-7, 5]
		],
		choices: { form: 'gable', gableSides: [1, 3] }
	},
	{
		name: '8 corners, hip with a wing',
		pts: [
			[-7, -5],
			[7, -5],
			[7, -3],
			[13, -3],
			[13, 2],
			[7, 2],
			[7, 5],
			[-7, 5]
		],
		choices: { form: 'hip' }
	},
	{
		name: '12 corners, hip on a cross',
		pts: [
			[-3, -9],
			[3, -9],
			[3, -3],
			[9, -3],
			[9, 3],
			[3, 3],
			[3, 9],
			[-3, 9],
			[-3, 3],
			[-9, 3],
			[-9, -3],
			[-3, -3]
		],
		choices: { form: 'hip' }
	}
];

export interface FootprintBench {
	name: string;
	corners: number;
	facets: number;
	medianMs: number;
	p95Ms: number;
	maxMs: number;
	runs: number;
}

export function benchFootprint(runs = 200): FootprintBench[] {
	const plane = localPlane(-74.46, 35.52);
	return SHAPES.map((s) => {
		const ring: Position[] = s.pts.map((p) => plane.toLonLat(p));
		ring.push([...ring[0]]);
		const choices: OutlineChoices = {
			form: 'hip',
			pitch: 6,
			sidePitches: null,
			gableSides: [],
			overhangM: 0.3,
			square: true,
			...s.choices
		};
		let facets = 0;
		for (let i = 0; i < 20; i++) roofFromOutline(ring, choices, 'warm');
		const times: number[] = [];
		for (let i = 0; i < runs; i++) {
			const t0 = performance.now();
			const r = roofFromOutline(ring, choices, 'bench');
			times.push(performance.now() - t0);
			if (!r.ok) throw new Error(`${s.name}: ${r.message}`);
			facets = r.facets.length;
		}
		times.sort((a, b) => a - b);
		return {
			name: s.name,
			corners: s.pts.length,
			facets,
			medianMs: times[Math.floor(runs / 2)],
			p95Ms: times[Math.floor(runs * 0.95)],
			maxMs: times[runs - 1],
			runs
		};
	});
}

export function footprintTable(rows: FootprintBench[]): string {
	const f = (x: number) => x.toFixed(2);
	return [
		`| outline | facets | median | p95 | slowest of ${rows[0]?.runs ?? 0} | target (p95) |`,
		'| --- | --- | --- | --- | --- | --- |',
		...rows.map(
			(r) =>
				`| ${r.name} | ${r.facets} | ${f(r.medianMs)} ms | ${f(r.p95Ms)} ms | ${f(r.maxMs)} ms | < ${FOOTPRINT_TARGET_MS} ms: ${r.p95Ms < FOOTPRINT_TARGET_MS ? 'met' : '**missed**'} |`
		)
	].join('\n');
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
	console.log(footprintTable(benchFootprint()));
}
