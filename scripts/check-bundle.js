// Build check: MapLibre (~300 KB gz) may load only on the roof-plan editor. Every other page's
// static import graph in the client build must be free of it; the script fails otherwise.
import fs from 'node:fs';
import path from 'node:path';

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
console.log(`Bundle check: ${sizes.length} route modules, MapLibre only on the roof editor.`);
