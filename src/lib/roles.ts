/** Roles and what each may open; shared by the server guard and the navigation. */
export const ROLES = ['owner', 'estimator', 'sales', 'crew'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
	owner: 'Owner',
	estimator: 'Estimator',
	sales: 'Sales',
	crew: 'Crew'
};

export type NavItem = { href: string; label: string };

const OFFICE = ['owner', 'estimator', 'sales'] as const;

/** Anyone may open a public route, signed in or not. */
export const PUBLIC = 'public';
export type Access = readonly Role[] | typeof PUBLIC;

/**
 * Every route of the app and who may open it, public ones included: one row per route, by its
 * URL pattern (the folder under src/routes with `(group)` segments dropped and `[name=matcher]`
 * written `[name]`). The server guard looks up the route SvelteKit matched, so:
 * a route with no row is refused to every role (403), a signed-out caller is sent to sign in
 * (401 on /api/) wherever the path leads, and a signed-in caller gets SvelteKit's 404 for a path
 * that matches no route. A row covers the route's page, its form actions and its endpoint
 * methods; each load, action and endpoint checks the role again with requireRole().
 * tests/unit/access/route-table.spec.ts fails when a route has no row or a row no route.
 */
export const ACCESS: readonly { route: string; roles: Access }[] = [
	{ route: '/', roles: ROLES },
	{ route: '/sign-in', roles: PUBLIC },
	{ route: '/sign-out', roles: ROLES },
	{ route: '/account', roles: ROLES },
	{ route: '/sites', roles: OFFICE },
	{ route: '/sites/new', roles: OFFICE },
	{ route: '/sites/[id]', roles: OFFICE },
	{ route: '/sites/[id]/roof', roles: OFFICE },
	{ route: '/estimates', roles: OFFICE },
	{ route: '/estimates/[id]', roles: OFFICE },
	{ route: '/schedule', roles: ['owner', 'sales'] },
	{ route: '/estimates/[id]/proposal', roles: OFFICE },
	// The customer's proposal: no account, the private link's token is the key.
	{ route: '/p/[token]', roles: PUBLIC },
	// The photos a sent proposal lists, on the customer's page: the same private link is the key.
	{ route: '/p/[token]/photos/[id]', roles: PUBLIC },
	// The final invoice's pay page: no account, the private link's token is the key.
	{ route: '/i/[token]', roles: PUBLIC },
	// The outbox, for the owner (its page answers 404 outside demo mode).
	{ route: '/outbox', roles: ['owner'] },
	{ route: '/estimates/[id]/visit', roles: OFFICE },
	{ route: '/crew', roles: ['owner', 'crew'] },
	// Crew open only the sheets of jobs they are on; the service answers 404 for the others.
	{ route: '/crew/[id]', roles: ['owner', 'crew'] },
	{ route: '/rates', roles: ['owner'] },
	{ route: '/team', roles: ['owner'] },
	{ route: '/settings', roles: ['owner'] },
	// The owner's books: reports with their tables' CSV, and the lists' CSV export and import.
	{ route: '/reports', roles: ['owner'] },
	{ route: '/reports/[table]', roles: ['owner'] },
	{ route: '/data', roles: ['owner'] },
	{ route: '/data/[kind]', roles: ['owner'] },
	{ route: '/settings/backup', roles: ['owner'] },
	{ route: '/audit', roles: ['owner'] },
	{ route: '/api/health', roles: PUBLIC },
	{ route: '/api/me', roles: ROLES },
	{ route: '/api/docs', roles: OFFICE },
	{ route: '/api/openapi.json', roles: OFFICE },
	{ route: '/api/estimates', roles: OFFICE },
	{ route: '/api/estimates/[id]', roles: OFFICE },
	{ route: '/api/estimates/[id]/photos', roles: OFFICE },
	{ route: '/api/rate-cards', roles: OFFICE },
	{ route: '/api/roof-plans', roles: OFFICE },
	{ route: '/api/roof-plans/[id]', roles: OFFICE },
	{ route: '/api/sites', roles: OFFICE },
	{ route: '/api/sites/[id]', roles: OFFICE },
	{ route: '/api/sites/[id]/roof-plans', roles: OFFICE },
	{ route: '/api/sites/[id]/roof-plans/[version]', roles: OFFICE },
	{ route: '/api/team', roles: ['owner'] },
	{ route: '/api/jobs/[id]', roles: ['owner', 'sales', 'crew'] },
	{ route: '/api/jobs/[id]/log', roles: ['owner', 'crew'] },
	// After photos: the crew on the job, and the owner.
	{ route: '/api/jobs/[id]/photos', roles: ['owner', 'crew'] },
	// The payment service's events: no account, the signature on the body is the check.
	{ route: '/api/payments/webhook', roles: PUBLIC },
	// Site-visit photos: any signed-in member of the company (the crew reads them on the job).
	{ route: '/photos/[id]/[rendition]', roles: ROLES },
	// The bundled sample imagery: generated pictures of an invented town, no company data.
	{ route: '/tiles/tiles.json', roles: PUBLIC },
	{ route: '/tiles/[z]/[x]/[y]', roles: PUBLIC }
];

/** Paths SvelteKit serves from outside src/routes (built assets); open like a public row. */
export const PUBLIC_FILES: readonly string[] = ['/_app/', '/favicon.svg', '/service-worker.js'];

export function isPublicFile(pathname: string): boolean {
	return PUBLIC_FILES.some((p) => (p.endsWith('/') ? pathname.startsWith(p) : pathname === p));
}

/** A SvelteKit route id as the table's URL pattern: `/(app)/sites/[id=id]` → `/sites/[id]`. */
export function routePattern(routeId: string): string {
	const segs = routeId
		.split('/')
		.filter((s) => s !== '' && !/^\(.+\)$/.test(s))
		.map((s) => s.replace(/\[(\.\.\.)?(\w+)=\w+\]/g, '[$1$2]'));
	return '/' + segs.join('/');
}

const BY_ROUTE = new Map(ACCESS.map((a) => [a.route, a.roles]));

/** Who may open the route SvelteKit matched; `undefined` (refused) for a route with no row. */
export function rolesForRoute(routeId: string): Access | undefined {
	return BY_ROUTE.get(routePattern(routeId));
}

const PARAM = /^\[\w+\]$/;

/**
 * Who may open a concrete path, for links and tests: `[param]` matches one non-empty segment,
 * and a static segment beats a parameter (`/sites/new` before `/sites/[id]`), as in SvelteKit.
 */
export function rolesFor(pathname: string): Access | undefined {
	const segs = pathname === '/' ? [] : pathname.slice(1).split('/');
	let best: { roles: Access; params: number } | undefined;
	for (const a of ACCESS) {
		const pat = a.route === '/' ? [] : a.route.slice(1).split('/');
		if (pat.length !== segs.length) continue;
		let params = 0;
		const hit = pat.every((p, i) => {
			if (PARAM.test(p)) return segs[i] !== '' && ++params > 0;
			return p === segs[i];
		});
		if (hit && (!best || params < best.params)) best = { roles: a.roles, params };
	}
	return best?.roles;
}

/** May this role open the path? Public rows are open to every role. */
export function mayOpen(role: Role, pathname: string): boolean {
	const access = rolesFor(pathname);
	return access === PUBLIC || (access?.includes(role) ?? false);
}

const NAV: readonly NavItem[] = [
	{ href: '/', label: 'Today' },
	{ href: '/sites', label: 'Sites' },
	{ href: '/estimates', label: 'Estimates' },
	{ href: '/schedule', label: 'Schedule' },
	{ href: '/crew', label: 'Crew sheets' },
	{ href: '/rates', label: 'Rates' },
	{ href: '/team', label: 'Team' },
	{ href: '/outbox', label: 'Outbox' },
	{ href: '/reports', label: 'Reports' },
	{ href: '/data', label: 'Import & export' },
	{ href: '/settings', label: 'Settings' },
	{ href: '/audit', label: 'Audit log' }
];

/** The links a role sees: read from ACCESS, so a link never offers what the guard refuses. */
export function navFor(role: Role): NavItem[] {
	return NAV.filter((n) => mayOpen(role, n.href));
}
