// Lists every route under src/routes from the files themselves, so the access tests cover a new
// route the moment its folder exists. Route ids follow SvelteKit's routing docs
// (https://svelte.dev/docs/kit/routing, /advanced-routing): `(group)` folders do not appear in
// the URL, `[name=matcher]` is one parameter, and `+page@.svelte` only resets the layout.
import fs from 'node:fs';
import path from 'node:path';

export const HTTP_METHODS = ['GET', 'HEAD', 'POST', 'PUT', 'PATCH', 'DELETE', 'OPTIONS'] as const;

export type RouteInfo = {
	/** SvelteKit's route id, e.g. `/(app)/sites/[id=id]`. */
	id: string;
	/** The URL pattern: groups dropped, matchers dropped, e.g. `/sites/[id]`. */
	pattern: string;
	page: boolean;
	/** Names of the page's form actions (`default` for an unnamed one). */
	actions: string[];
	/** Methods a `+server.ts` exports. */
	methods: string[];
};

/** SvelteKit's route id as a URL pattern: `(group)` segments out, `[x=matcher]` → `[x]`. */
export function patternOf(routeId: string): string {
	const segs = routeId
		.split('/')
		.filter((s) => s && !/^\(.+\)$/.test(s))
		.map((s) => s.replace(/\[(\.\.\.)?(\w+)=\w+\]/g, '[$1$2]'));
	return '/' + segs.join('/');
}

/** Source text with comments and string contents blanked, so brackets can be counted. */
function blankStrings(src: string): string {
	let out = '';
	for (let i = 0; i < src.length; i++) {
		const c = src[i];
		if (c === '/' && src[i + 1] === '/') {
			while (i < src.length && src[i] !== '\n') i++;
			out += '\n';
		} else if (c === '/' && src[i + 1] === '*') {
			i = src.indexOf('*/', i + 2) + 1;
			out += ' ';
		} else if (c === "'" || c === '"' || c === '`') {
			let j = i + 1;
			while (j < src.length && src[j] !== c) j += src[j] === '\\' ? 2 : 1;
			out += c + ' '.repeat(j - i - 1) + c;
			i = j;
		} else out += c;
	}
	return out;
}

/** Keys of `export const actions = { … }`, read from the file's text (top-level keys only). */
export function actionNames(source: string): string[] {
	const src = blankStrings(source);
	const start = src.search(/export\s+const\s+actions\b/);
	if (start < 0) return [];
	const open = src.indexOf('{', src.indexOf('=', start));
	const parts: string[] = [];
	let depth = 0;
	let from = open + 1;
	for (let i = open; i < src.length; i++) {
		const c = src[i];
		if ('{(['.includes(c)) depth++;
		else if ('})]'.includes(c)) {
			if (--depth === 0) {
				parts.push(src.slice(from, i));
				break;
			}
		} else if (c === ',' && depth === 1) {
			parts.push(src.slice(from, i));
			from = i + 1;
		}
	}
	return parts
		.map((p) => p.trim().match(/^(?:async\s+)?(\w+)\s*[:(]/)?.[1])
		.filter((n): n is string => !!n);
}

/** Methods a `+server.ts` exports as `export const GET` or `export (async) function GET`. */
export function endpointMethods(source: string): string[] {
	const found = new Set<string>();
	const re = /export\s+(?:const|let|(?:async\s+)?function)\s+([A-Z]+)\b/g;
	let m: RegExpExecArray | null;
	while ((m = re.exec(source))) {
		if ((HTTP_METHODS as readonly string[]).includes(m[1]) || m[1] === 'fallback') {
			found.add(m[1]);
		}
	}
	return [...found];
}

export function listRoutes(root = path.resolve('src/routes')): RouteInfo[] {
	const out: RouteInfo[] = [];
	const walk = (dir: string) => {
		const entries = fs.readdirSync(dir, { withFileTypes: true });
		const files = entries.filter((e) => e.isFile()).map((e) => e.name);
		const rel = path.relative(root, dir).split(path.sep).filter(Boolean);
		const id = '/' + rel.join('/');
		const page = files.some((f) => /^\+page(@[^.]*)?\.svelte$/.test(f));
		const serverPage = files.find((f) => /^\+page\.server\.(ts|js)$/.test(f));
		const endpoint = files.find((f) => /^\+server\.(ts|js)$/.test(f));
		if (page || serverPage || endpoint) {
			out.push({
				id,
				pattern: patternOf(id),
				page: page || !!serverPage,
				actions: serverPage ? actionNames(fs.readFileSync(path.join(dir, serverPage), 'utf8')) : [],
				methods: endpoint ? endpointMethods(fs.readFileSync(path.join(dir, endpoint), 'utf8')) : []
			});
		}
		for (const e of entries) if (e.isDirectory()) walk(path.join(dir, e.name));
	};
	walk(root);
	return out.sort((a, b) => a.pattern.localeCompare(b.pattern));
}
