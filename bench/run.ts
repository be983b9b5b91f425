/**
 * `npm run bench`: the estimating model alone, then the API against its empty endpoint on the
 * built server (run `npx vite build` first). Prints a markdown table and writes bench/results.md.
 */
import fs from 'node:fs';
import os from 'node:os';
import { benchApi } from './api';
import { benchEditor, editorTable } from './editor';
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

console.log('Editor: live totals, snapping, bundle sizes, time to first map…');
const editor = await benchEditor({ browser: true });
const editorMd = editorTable(editor);

const ok = (pass: boolean) => (pass ? 'met' : '**missed**');
const modelOk = model.estimatesPerSec >= MODEL_TARGET;
const ratioOk = medianRatio <= RATIO_TARGET;

const table = [
	'| benchmark | figure | target | result |',
	'| --- | --- | --- | --- |',
	`| model, 30-facet roof | ${Math.round(model.estimatesPerSec).toLocaleString('en-US')} estimates/s (${fmt(model.usPerEstimate, 1)} µs each) | ≥ ${MODEL_TARGET.toLocaleString('en-US')}/s | ${ok(modelOk)} |`,
	`| \`POST /api/health\` (empty) | median ${fmt(api.health.medianMs)} ms, p99 ${fmt(api.health.p99Ms)} ms, ${Math.round(api.health.reqPerSec).toLocaleString('en-US')} req/s | — | — |`,
	`| \`POST /api/estimates\` (priced, not saved) | median ${fmt(api.estimates.medianMs)} ms, p99 ${fmt(api.estimates.p99Ms)} ms, ${Math.round(api.estimates.reqPerSec).toLocaleString('en-US')} req/s | — | — |`,
	`| ratio estimates ÷ empty | median ×${fmt(medianRatio)}, p99 ×${fmt(p99Ratio)} | median ≤ ×${RATIO_TARGET} | ${ok(ratioOk)} |`
].join('\n');

const setting =
	`${api.connections} connections, ${api.secondsEach} s per endpoint in ${api.rounds} alternating rounds after a 3 s warm-up, ` +
	`${api.pricingThreads ? `${api.pricingThreads} pricing threads` : 'pricing on the main thread'}, ` +
	`same ${fmt(api.bodyBytes / 1024, 1)} KB body and API token for both, built server on PGlite; ` +
	`${os.cpus().length} × ${os.cpus()[0]?.model.trim() ?? 'CPU'}, Node ${process.version}, load average ${fmt(loadBefore, 1)} → ${fmt(os.loadavg()[0], 1)}, ${new Date().toISOString().slice(0, 10)}.`;

const md = `# Benchmarks\n\n\`npm run bench\` (after \`npx vite build\`).\n\n${table}\n\n${setting}\n\n## Roof-plan editor\n\n${editorMd}\n`;
console.log('\n' + table + '\n\n' + setting + '\n\n' + editorMd);
fs.writeFileSync(new URL('./results.md', import.meta.url), md);
console.log('\nWritten to bench/results.md');
if (!modelOk || !ratioOk) process.exitCode = 1;
