/** Roles and what each may open; shared by the server guard and the navigation. */
export const ROLES = ['owner', 'estimator', 'sales', 'crew'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
	owner: 'Owner',
	estimator: 'Estimator',
	sales: 'Sales',
	crew: 'Crew'
};

export type NavItem = { href: string; label: string; roles: readonly Role[] };

const OFFICE = ['owner', 'estimator', 'sales'] as const;

export const NAV: readonly NavItem[] = [
	{ href: '/', label: 'Today', roles: ROLES },
	{ href: '/sites', label: 'Sites', roles: OFFICE },
	{ href: '/estimates', label: 'Estimates', roles: OFFICE },
	{ href: '/crew', label: 'Crew sheets', roles: ['owner', 'crew'] },
	{ href: '/rates', label: 'Rates', roles: ['owner'] },
	{ href: '/team', label: 'Team', roles: ['owner'] },
	{ href: '/settings', label: 'Settings', roles: ['owner'] }
];

/**
 * Path prefixes and the roles allowed there, most specific first. The server guard
 * refuses anything not listed here for a signed-in user, so a new route must be added.
 */
export const ACCESS: readonly { prefix: string; roles: readonly Role[] }[] = [
	{ prefix: '/api/team', roles: ['owner'] },
	{ prefix: '/api/tokens', roles: ['owner'] },
	{ prefix: '/api/settings', roles: ['owner'] },
	{ prefix: '/api/rate-cards', roles: OFFICE },
	{ prefix: '/api/estimates', roles: OFFICE },
	{ prefix: '/api/sites', roles: OFFICE },
	{ prefix: '/api/roof-plans', roles: OFFICE },
	{ prefix: '/api/me', roles: ROLES },
	{ prefix: '/api/docs', roles: OFFICE },
	{ prefix: '/api/openapi.json', roles: OFFICE },
	{ prefix: '/sites', roles: OFFICE },
	{ prefix: '/estimates', roles: OFFICE },
	{ prefix: '/crew', roles: ['owner', 'crew'] },
	{ prefix: '/rates', roles: ['owner'] },
	{ prefix: '/team', roles: ['owner'] },
	{ prefix: '/settings', roles: ['owner'] },
	{ prefix: '/account', roles: ROLES },
	{ prefix: '/sign-out', roles: ROLES },
	{ prefix: '/', roles: ROLES }
];

export function rolesFor(pathname: string): readonly Role[] | undefined {
	const hit = ACCESS.find(
		(a) =>
			pathname === a.prefix ||
			a.prefix === '/' ||
			pathname.startsWith(a.prefix.endsWith('/') ? a.prefix : a.prefix + '/')
	);
	return hit?.roles;
}

export function navFor(role: Role): NavItem[] {
	return NAV.filter((n) => n.roles.includes(role));
}
