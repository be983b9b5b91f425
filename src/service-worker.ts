/// <reference types="@sveltejs/kit" />
/// <reference no-default-lib="true"/>
/// <reference lib="esnext" />
/// <reference lib="webworker" />
/**
 * Keeps crew sheets readable with a weak or no signal. The app's built files are cached at
 * install; a crew sheet page (and the list of sheets, and their data requests) is fetched from
 * the network when there is one and kept, so the last copy opens offline. Every other request
 * is left to the browser as if there were no worker. The crew's ticks are not cached here:
 * the sheet keeps them in IndexedDB and sends them itself.
 */
import { build, files, version } from '$service-worker';

const sw = self as unknown as ServiceWorkerGlobalScope;

const SHELL = `shell-${version}`;
const SHEETS = 'crew-sheets';
const SHELL_FILES = new Set([...build, ...files]);

sw.addEventListener('install', (event) => {
	event.waitUntil(
		caches
			.open(SHELL)
			.then((c) => c.addAll([...SHELL_FILES]))
			.then(() => sw.skipWaiting())
	);
});

sw.addEventListener('activate', (event) => {
	event.waitUntil(
		(async () => {
			for (const key of await caches.keys()) {
				if (key !== SHELL && key !== SHEETS) await caches.delete(key);
			}
			await sw.clients.claim();
		})()
	);
});

/** The crew sheet pages and their data: `/crew`, `/crew/<id>`, and kit's `__data.json`. */
const isSheet = (path: string) => /^\/crew(\/[0-9a-f-]{36})?(\/__data\.json)?$/i.test(path);

sw.addEventListener('fetch', (event) => {
	const req = event.request;
	const url = new URL(req.url);
	if (url.origin !== sw.location.origin) return;
	// Signing out drops the kept sheets: their addresses and gate codes stay with the signed-in.
	if (url.pathname === '/sign-out' && req.method === 'POST') {
		event.waitUntil(caches.delete(SHEETS));
		return;
	}
	if (req.method !== 'GET') return;
	if (SHELL_FILES.has(url.pathname)) {
		event.respondWith(caches.match(req).then((hit) => hit ?? fetch(req)));
		return;
	}
	if (isSheet(url.pathname)) event.respondWith(networkThenKept(req));
});

async function networkThenKept(req: Request): Promise<Response> {
	const cache = await caches.open(SHEETS);
	try {
		const res = await fetch(req);
		// Only a real sheet is kept: not a sign-in redirect, an error or a refusal.
		if (res.ok && !res.redirected && res.type === 'basic') await cache.put(req, res.clone());
		return res;
	} catch {
		const kept = await cache.match(req, { ignoreVary: true });
		if (kept) return kept;
		return new Response('Offline, and this crew sheet was not opened on this device before.', {
			status: 503,
			headers: { 'content-type': 'text/plain; charset=utf-8' }
		});
	}
}
