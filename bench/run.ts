/**
 * `npm run bench`: the estimating model alone, then the API against its empty endpoint on the
 * built server (run `npx vite build` first). Prints a markdown table and writes bench/results.md.
 */
import fs from 'node:fs';
import os from 'node:os';
import { benchApi } from './api';
import { benchEditor, editorTable } from './editor';
import { benchFootprint, footprintTable, FOOTPRINT_TARGET_MS } from './footprint';
import { benchGrowth, growthTable } from './growth';
import { benchLists, benchMixed } from './load';
import { benchModel } from './model';

const MODEL_TARGET = 20_000;
const RATIO_TARGET = 1.3;

const fmt = (x: number, d = 2) =>
	x.toLocaleString('en-US', { maximumFractionDigits: d, minimumFractionDigits: d });

// Other work on the machine skews both figures; the load average goes into the results.
const loadBefore = os.loadavg()[0];
console.log('Model: pricing a 30-facet roof…');
const model = await benchModel({ durationMs: 3000 });
console.log(`  ${Math.round(model.estimatesPerSec).toLocaleString('en-US')} estimates/s`);

console.log('API: POST /api/estimates against POST /api/health, 10 connections…');
const api = await benchApi();
const medianRatio = api.estimates.medianMs / api.health.medianMs;
const p99Ratio = api.estimates.p99Ms / api.health.p99Ms;

console.log('Mixed load: 50 connections for 60 s…');
const mixed = await benchMixed();
console.log(`  ${mixed.requests} requests, ${mixed.errors} errors`);

console.log('Large lists: demo data against 10,000 sites and 20,000 estimates…');
const lists = await benchLists();
const LIST_TARGET = 2;
const worstListRatio = Math.max(...lists.lists.map((l) => l.bigMs / l.smallMs));

console.log('Editor: live totals, snapping, bundle sizes, time to first map…');
const editor = await benchEditor({ browser: true });
const editorMd = editorTable(editor);

console.log('Roof from outline: last corner to facets, 4, 8 and 12 corners…');
const footprint = benchFootprint();
const footprintMd = footprintTable(footprint);
const footprintOk = footprint.every((r) => r.p95Ms < FOOTPRINT_TARGET_MS);

console.log('Growth suggestion: decoded tiles to a grade, per scene facet…');
const growthMd = growthTable(await benchGrowth());

const ok = (pass: boolean) => (pass ? 'met' : '**missed**');
const modelOk = model.estimatesPerSec >= MODEL_TARGET;
const ratioOk = medianRatio <= RATIO_TARGET;
const mixedOk = mixed.errors === 0;
const listsOk = worstListRatio <= LIST_TARGET;

const table = [
	'| benchmark | figure | target | result |',
	'| --- | --- | --- | --- |',
	`| model, 30-facet roof | ${Math.round(model.estimatesPerSec).toLocaleString('en-US')} estimates/s (${fmt(model.usPerEstimate, 1)} µs each) | ≥ ${MODEL_TARGET.toLocaleString('en-US')}/s | ${ok(modelOk)} |`,
	`| \`POST /api/health\` (empty) | median ${fmt(api.health.medianMs)} ms, p99 ${fmt(api.health.p99Ms)} ms, ${Math.round(api.health.reqPerSec).toLocaleString('en-US')} req/s | — | — |`,
	`| \`POST /api/estimates\` (priced, not saved) | median ${fmt(api.estimates.medianMs)} ms, p99 ${fmt(api.estimates.p99Ms)} ms, ${Math.round(api.estimates.reqPerSec).toLocaleString('en-US')} req/s | — | — |`,
	`| ratio estimates ÷ empty | median ×${fmt(medianRatio)}, p99 ×${fmt(p99Ratio)} | median ≤ ×${RATIO_TARGET} | ${ok(ratioOk)} |`,
	`| mixed load, ${mixed.connections} connections for ${mixed.seconds} s (pages, lists, search, \`POST /api/estimates\`, one in four saved) | ${mixed.requests.toLocaleString('en-US')} requests, ${Math.round(mixed.reqPerSec)} req/s, ${mixed.errors} errors, median ${fmt(mixed.medianMs)} ms, p99 ${fmt(mixed.p99Ms)} ms | 0 errors | ${ok(mixedOk)} |`
].join('\n');

const listTable = [
	`| list (median of 40 requests) | demo data | + ${lists.bigSites.toLocaleString('en-US')} sites, ${lists.bigEstimates.toLocaleString('en-US')} estimates | ratio | target |`,
	'| --- | --- | --- | --- | --- |',
	...lists.lists.map(
		(l) =>
			`| ${l.name}${l.matches ? ` (finds ${l.matches.small} → ${l.matches.big.toLocaleString('en-US')})` : ''} | ${fmt(l.smallMs)} ms | ${fmt(l.bigMs)} ms | ×${fmt(l.bigMs / l.smallMs)} | ≤ ×${LIST_TARGET}: ${ok(l.bigMs / l.smallMs <= LIST_TARGET)} |`
	)
].join('\n');

const setting =
	`${api.connections} connections, ${api.secondsEach} s per endpoint in ${api.rounds} alternating rounds after a 3 s warm-up, ` +
	`${api.pricingThreads ? `${api.pricingThreads} pricing threads` : 'pricing on the main thread'}, ` +
	`same ${fmt(api.bodyBytes / 1024, 1)} KB body and API token for both, built server on PGlite; ` +
	`${os.cpus().length} × ${os.cpus()[0]?.model.trim() ?? 'CPU'}, Node ${process.version}, load average ${fmt(loadBefore, 1)} → ${fmt(os.loadavg()[0], 1)}, ${new Date().toISOString().slice(0, 10)}.`;

const md = `# Benchmarks\n\n\`npm run bench\` (after \`npx vite build\`).\n\n${table}\n\n${setting}\n\n## Large lists\n\n${listTable}\n\n## Roof-plan editor\n\n${editorMd}\n\n## Roof from outline\n\n${footprintMd}\n\n## Growth suggestion\n\n${growthMd}\n`;
console.log(
	'\n' +
		table +
		'\n\n' +
		setting +
		'\n\n' +
		listTable +
		'\n\n' +
		editorMd +
		'\n\n' +
		footprintMd +
		'\n\n' +
		growthMd
);
fs.writeFileSync(new URL('./results.md', import.meta.url), md);
console.log('\nWritten to bench/results.md');
if (!modelOk || !ratioOk || !mixedOk || !listsOk || !footprintOk) process.exitCode = 1;
