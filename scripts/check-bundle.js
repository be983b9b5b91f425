// Build check: MapLibre (~300 KB gz) may load only on the roof-plan editor. Every other page's
// static import graph in the client build must be free of it; the script fails otherwise.
// The customer's proposal page (/p/[token]) is opened on phones: everything it loads at start
// (kit's entry, the root layout and the page, with their static imports) must stay within
// 100 KB of gzip JavaScript, and carry no map library at all.
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';

const root = '.svelte-kit/output/client';
const manifest = JSON.parse(fs.readFileSync(path.join(root, '.vite/manifest.json'), 'utf8'));
const EDITOR = /^src\/routes\/\(app\)\/sites\/\[id=id\]\/roof\//;
const marker = /maplibre-gl|maplibregl/i;

const contentCache = new Map();
function carriesMapLibre(file) {
	if (!contentCache.has(file)) {
		contentCache.set(file, marker.test(fs.readFileSync(path.join(root, file), 'utf8')));
	}
	return contentCache.get(file);
}

function staticClosure(key, seen = new Set()) {
	if (seen.has(key)) return seen;
	seen.add(key);
	for (const dep of manifest[key]?.imports ?? []) staticClosure(dep, seen);
	return seen;
}

const failures = [];
const sizes = [];
/** Each generated client node re-exports one route component; read which. */
function routeOf(entry) {
	if (!/generated\/client-optimized\/nodes\/\d+\.js$/.test(entry.src ?? '')) return null;
	const text = fs.readFileSync(entry.src, 'utf8');
	const m = text.match(/src\/routes\/[^"']+\.svelte/);
	return m ? m[0] : '(no component)';
}

for (const [key, entry] of Object.entries(manifest)) {
	const route = routeOf(entry);
	if (!route) continue;
	const files = [...staticClosure(key)].map((k) => manifest[k].file);
	const bytes = files.reduce((n, f) => n + fs.statSync(path.join(root, f)).size, 0);
	sizes.push([route, bytes]);
	if (EDITOR.test(route)) continue;
	const bad = files.filter(carriesMapLibre);
	if (bad.length) failures.push(`${route} statically loads MapLibre via ${bad.join(', ')}`);
}

if (failures.length) {
	console.error('MapLibre must load only on the roof-plan editor:\n' + failures.join('\n'));
	process.exit(1);
}

const CUSTOMER = 'src/routes/p/[token]/+page.svelte';
const CUSTOMER_BUDGET = 100 * 1024;
const MAP_LIBRARY = /maplibre-gl|maplibregl|leaflet/i;
// Kit's own entries (every route node is an entry too, loaded only when its route opens).
const startKeys = Object.entries(manifest)
	.filter(([k, e]) => e.isEntry && !/\/nodes\/\d+\.js$/.test(k))
	.map(([k]) => k);
const nodeKeys = Object.entries(manifest)
	.filter(([, e]) => ['src/routes/+layout.svelte', CUSTOMER].includes(routeOf(e) ?? ''))
	.map(([k]) => k);
if (nodeKeys.length !== 2) {
	console.error(`Bundle check: could not find the root layout and ${CUSTOMER} in the build.`);
	process.exit(1);
}
const customerFiles = new Set();
for (const k of [...startKeys, ...nodeKeys]) {
	for (const dep of staticClosure(k)) {
		const file = manifest[dep].file;
		if (file.endsWith('.js')) customerFiles.add(file);
	}
}
let customerGzip = 0;
const mapped = [];
for (const f of customerFiles) {
	const bytes = fs.readFileSync(path.join(root, f));
	customerGzip += zlib.gzipSync(bytes, { level: 9 }).length;
	if (MAP_LIBRARY.test(bytes.toString('utf8'))) mapped.push(f);
}
const kb = (n) => `${(n / 1024).toFixed(1)} KB`;
if (mapped.length) {
	console.error(`${CUSTOMER} loads a map library via ${mapped.join(', ')}`);
	process.exit(1);
}
if (customerGzip > CUSTOMER_BUDGET) {
	console.error(
		`${CUSTOMER} loads ${kb(customerGzip)} of gzip JavaScript; the budget is ${kb(CUSTOMER_BUDGET)}.`
	);
	process.exit(1);
}
console.log(
	`Bundle check: ${sizes.length} route modules, MapLibre only on the roof editor; ` +
		`the customer's proposal page loads ${kb(customerGzip)} gzip JS (budget ${kb(CUSTOMER_BUDGET)}).`
);
