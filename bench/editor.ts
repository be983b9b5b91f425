/**
 * Roof-editor benchmark: live totals per edit and snapping per pointer move on a 30-facet plan,
 * the editor's client JavaScript against the other pages (from the Vite manifest), and how long
 * the editor takes to show its map in headless Chromium. Run directly with `npx tsx bench/editor.ts`
 * (after `npx vite build` for the last two), or import benchEditor() from a bench runner.
 */
import fs from 'node:fs';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { pathToFileURL } from 'node:url';
import { gzipSync } from 'node:zlib';
import type { Polygon } from 'geojson';
import { featuresOf, house } from '../geodata/scene';
import { measurePlan, PlanMeasurer, type MeasurableFacet } from '../src/lib/map/plan-measure';
import { createSnapIndex, snapPoint, type LonLat } from '../src/lib/map/snap';

export interface EditorBench {
	facets: number;
	/** Re-measuring the plan after one facet changed (what a vertex drag costs per frame). */
	liveTotalsUsPerEdit: number;
	/** Measuring all 30 facets from scratch (a load or an undo). */
	fullMeasureUs: number;
	snapUsPerMove: number;
	snapIndexBuildUs: number;
	bundle: BundleFigures | null;
	timeToMap: { maplibreMs: number; leafletMs: number } | null;
}

export interface BundleFigures {
	/** gzip bytes of each page's static client graph, editor first. */
	pages: { route: string; gzipBytes: number }[];
	/** gzip bytes the editor loads on demand: MapLibre + draw, or (without WebGL2) Leaflet + geoman. */
	onDemand: { maplibreGzipBytes: number; leafletGzipBytes: number };
}

/** 30 real facet outlines from the sample scene (its first 30), with their pitches. */
export function benchPlan(n = 30): MeasurableFacet[] {
	return featuresOf('facet')
		.slice(0, n)
		.map((f) => ({
			id: f.properties.facetId,
			geometry: f.geometry,
			pitch: f.properties.pitch,
			edges: f.properties.edges
		}));
}

function timeIt(run: () => void, minMs = 400): number {
	for (let i = 0; i < 50; i++) run();
	let n = 0;
	const start = performance.now();
	while (performance.now() - start < minMs) {
		for (let i = 0; i < 20; i++) run();
		n += 20;
	}
	return ((performance.now() - start) * 1000) / n;
}

/** EPSG:3857 pixels at MapLibre zoom 21, standing in for map.project(). */
function mercator(zoom: number) {
	const size = 512 * 2 ** zoom;
	return ([lon, lat]: LonLat) => {
		const s = Math.sin((lat * Math.PI) / 180);
		return {
			x: ((lon + 180) / 360) * size,
			y: (0.5 - Math.log((1 + s) / (1 - s)) / (4 * Math.PI)) * size
		};
	};
}

export function benchLive(facets = benchPlan()) {
	const measurer = new PlanMeasurer();
	measurer.measure(facets);
	let k = 0;
	const liveTotalsUsPerEdit = timeIt(() => {
		// one facet's outline replaced, as during a drag: a fresh geometry object each frame
		const i = k++ % facets.length;
		const g = facets[i].geometry;
		const moved: Polygon = {
			type: 'Polygon',
			coordinates: [g.coordinates[0].map(([x, y]) => [x + 1e-9 * (k % 7), y])]
		};
		const next = facets.slice();
		next[i] = { ...facets[i], geometry: moved };
		measurer.measure(next);
	});
	const fullMeasureUs = timeIt(() => measurePlan(facets));

	const project = mercator(21);
	const rings = facets.map((f) => ({ facetId: f.id, ring: f.geometry.coordinates[0] }));
	const snapIndexBuildUs = timeIt(() => createSnapIndex(rings));
	const index = createSnapIndex(rings);
	const corners = facets.flatMap((f) => f.geometry.coordinates[0].slice(0, -1) as LonLat[]);
	let j = 0;
	const snapUsPerMove = timeIt(() => {
		const c = project(corners[j++ % corners.length]);
		snapPoint(index, { x: c.x + (j % 13) - 6, y: c.y + (j % 9) - 4 }, project, 10);
	});
	return { liveTotalsUsPerEdit, fullMeasureUs, snapIndexBuildUs, snapUsPerMove };
}

/** Per-page static client graph from the Vite manifest, as scripts/check-bundle.js reads it. */
export function benchBundle(root = '.svelte-kit/output/client'): BundleFigures | null {
	const file = path.join(root, '.vite/manifest.json');
	if (!fs.existsSync(file)) return null;
	const manifest = JSON.parse(fs.readFileSync(file, 'utf8')) as Record<
		string,
		{ file: string; src?: string; imports?: string[]; dynamicImports?: string[] }
	>;
	const gz = new Map<string, number>();
	const size = (f: string) => {
		if (!gz.has(f)) gz.set(f, gzipSync(fs.readFileSync(path.join(root, f))).length);
		return gz.get(f)!;
	};
	const closure = (key: string, seen = new Set<string>()) => {
		if (seen.has(key)) return seen;
		seen.add(key);
		for (const d of manifest[key]?.imports ?? []) closure(d, seen);
		return seen;
	};
	const pages: BundleFigures['pages'] = [];
	const onDemand = { maplibreGzipBytes: 0, leafletGzipBytes: 0 };
	for (const [key, entry] of Object.entries(manifest)) {
		if (!/generated\/client-optimized\/nodes\/\d+\.js$/.test(entry.src ?? '')) continue;
		const text = fs.readFileSync(entry.src!, 'utf8');
		const route = text.match(/src\/routes\/[^"']+\.svelte/)?.[0];
		if (!route || !/\+page(@[^.]*)?\.svelte$/.test(route)) continue;
		const files = closure(key);
		const bytes = [...files].reduce((n, k) => n + size(manifest[k].file), 0);
		pages.push({ route: route.replace(/^src\/routes/, ''), gzipBytes: bytes });
		if (route.includes('/roof/')) {
			// what the editor pulls in once it knows which map it can run
			for (const [which, src] of [
				['maplibreGzipBytes', 'src/lib/map/maplibre-editor.ts'],
				['leafletGzipBytes', 'src/lib/map/leaflet-editor.ts']
			] as const) {
				const key = Object.keys(manifest).find((k) => manifest[k].src === src);
				if (!key) continue;
				const dyn = closure(key);
				for (const k of [...dyn])
					for (const d of manifest[k]?.dynamicImports ?? []) closure(d, dyn);
				for (const k of files) dyn.delete(k);
				onDemand[which] = [...dyn].reduce((n, k) => n + size(manifest[k].file), 0);
			}
		}
	}
	pages.sort(
		(a, b) =>
			Number(b.route.includes('/roof/')) - Number(a.route.includes('/roof/')) ||
			b.gzipBytes - a.gzipBytes
	);
	return { pages, onDemand };
}

/** Median time from navigation start to the editor's first drawn map, both engines. */
export async function benchTimeToMap(runs = 3): Promise<EditorBench['timeToMap']> {
	if (!fs.existsSync('build/index.js')) return null;
	const { seededDataDir, startServer, DEMO, DEMO_PASSWORD } =
		await import('../tests/helpers/server');
	const { openBrowser } = await import('../tests/helpers/browser');
	const server = await startServer(seededDataDir('bench-editor'));
	const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)];
	try {
		const out: Record<'maplibre' | 'leaflet', number[]> = { maplibre: [], leaflet: [] };
		for (const kind of ['maplibre', 'leaflet'] as const) {
			const ctx = await openBrowser({ width: 1280, height: 900, webgl: kind === 'maplibre' });
			try {
				const page = ctx.pages()[0] ?? (await ctx.newPage());
				await page.goto(`${server.url}/sign-in`);
				await page.fill('input[name=email]', DEMO.estimator);
				await page.fill('input[name=password]', DEMO_PASSWORD);
				await Promise.all([page.waitForURL(`${server.url}/`), page.click('form button')]);
				const { sites } = await (await page.request.get(`${server.url}/api/sites`)).json();
				const address = house('h04')!.properties.address;
				const site = sites.find((s: { address: string }) => s.address === address);
				for (let i = 0; i < runs + 1; i++) {
					await page.goto(`${server.url}/sites/${site.id}/roof`);
					await page.waitForFunction(() => (window.__clearpitchMap?.readyAt ?? 0) > 0, null, {
						timeout: 60_000
					});
					const ms = await page.evaluate(() => window.__clearpitchMap!.readyAt);
					if (i > 0) out[kind].push(ms); // the first load warms the HTTP cache and the server
				}
			} finally {
				await ctx.close();
			}
		}
		return { maplibreMs: median(out.maplibre), leafletMs: median(out.leaflet) };
	} finally {
		await server.stop();
	}
}

export async function benchEditor(opts: { browser?: boolean } = {}): Promise<EditorBench> {
	const facets = benchPlan();
	const live = benchLive(facets);
	return {
		facets: facets.length,
		...live,
		bundle: benchBundle(),
		timeToMap: opts.browser === false ? null : await benchTimeToMap()
	};
}

export function editorTable(b: EditorBench): string {
	const kb = (n: number) => `${(n / 1024).toFixed(1)} KB`;
	const us = (n: number) => `${n.toFixed(1)} µs`;
	const rows = [
		'| editor figure | value |',
		'| --- | --- |',
		`| live totals after one edit, ${b.facets}-facet plan (incremental) | ${us(b.liveTotalsUsPerEdit)} |`,
		`| measuring all ${b.facets} facets from scratch (load, undo) | ${us(b.fullMeasureUs)} |`,
		`| snapping, per pointer move over ${b.facets} facets | ${us(b.snapUsPerMove)} |`,
		`| building the snap index for ${b.facets} facets | ${us(b.snapIndexBuildUs)} |`
	];
	if (b.bundle) {
		const editor = b.bundle.pages.find((p) => p.route.includes('/roof/'));
		const others = b.bundle.pages.filter((p) => !p.route.includes('/roof/'));
		const largest = others[0];
		if (editor) rows.push(`| editor page, static client JS (gzip) | ${kb(editor.gzipBytes)} |`);
		rows.push(
			`| editor, loaded on demand: MapLibre + mapbox-gl-draw (gzip) | ${kb(b.bundle.onDemand.maplibreGzipBytes)} |`
		);
		rows.push(
			`| editor, loaded on demand without WebGL2: Leaflet + geoman (gzip) | ${kb(b.bundle.onDemand.leafletGzipBytes)} |`
		);
		if (largest)
			rows.push(
				`| largest other page (${largest.route}), static client JS (gzip) | ${kb(largest.gzipBytes)} |`
			);
		const median = others.map((p) => p.gzipBytes).sort((x, y) => x - y)[
			Math.floor(others.length / 2)
		];
		if (others.length)
			rows.push(`| median of the other ${others.length} pages (gzip) | ${kb(median)} |`);
	}
	if (b.timeToMap) {
		rows.push(
			`| time to first map, MapLibre (headless Chromium, SwiftShader) | ${Math.round(b.timeToMap.maplibreMs)} ms |`
		);
		rows.push(
			`| time to first map, Leaflet fallback (no WebGL) | ${Math.round(b.timeToMap.leafletMs)} ms |`
		);
	}
	return rows.join('\n');
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
	const b = await benchEditor({ browser: !process.argv.includes('--no-browser') });
	console.log(editorTable(b));
	if (b.bundle) {
		console.log('\n| page | static client JS (gzip) |\n| --- | --- |');
		for (const p of b.bundle.pages)
			console.log(`| ${p.route} | ${(p.gzipBytes / 1024).toFixed(1)} KB |`);
	}
}
