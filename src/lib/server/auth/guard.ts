import { error, redirect, type RequestEvent } from '@sveltejs/kit';
import type { Role } from '$lib/roles';

export type SignedInUser = NonNullable<App.Locals['user']>;

/** Every load, action and endpoint calls this (or requireRole) first. */
export function requireUser(event: RequestEvent): SignedInUser {
	const user = event.locals.user;
	if (!user) {
		if (event.route.id?.startsWith('/api') || event.url.pathname.startsWith('/api/')) {
			error(401, 'Sign in first, or send an API token as "Authorization: Bearer …".');
		}
		redirect(303, `/sign-in?next=${encodeURIComponent(event.url.pathname + event.url.search)}`);
	}
	return user;
}

export function requireRole(event: RequestEvent, ...roles: Role[]): SignedInUser {
	const user = requireUser(event);
	if (!roles.includes(user.role)) {
		error(403, `This needs the ${roles.join(' or ')} role; you are signed in as ${user.role}.`);
	}
	return user;
}
