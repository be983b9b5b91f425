import {
	error,
	redirect,
	type Handle,
	type HandleServerError,
	type ServerInit
} from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { PUBLIC, isPublicFile, rolesForRoute, routePattern } from '$lib/roles';
import { closeDb, getDb } from '$lib/server/db';
import { DataDirLockedError } from '$lib/server/db/lock';
import { ConfigError } from '$lib/server/env';
import { resolveCaller } from '$lib/server/auth/session';
import { startPricing, stopPricing } from '$lib/server/pricing/pool';
import { getMailTransport, startMailRetryLoop } from '$lib/server/mail';

export const init: ServerInit = async () => {
	let mail: ReturnType<typeof startMailRetryLoop> | undefined;
	try {
		// The data-directory lock first: a second server on a held directory stops here, before
		// it has spawned a pricing thread that would only slow the server already running.
		await getDb();
		await startPricing();
		// Messages the mail server did not take (or that were written while it was down) are
		// tried again from the outbox until they go or are given up, and then shown as such.
		mail = startMailRetryLoop({ db: getDb, transport: getMailTransport() });
		void mail.runNow();
	} catch (e) {
		// sysexits.h: EX_CONFIG for a bad setting, EX_TEMPFAIL while another server holds the data.
		const code = e instanceof ConfigError ? 78 : e instanceof DataDirLockedError ? 75 : null;
		if (code === null) throw e;
		console.error(`\nClearpitch cannot start: ${(e as Error).message}\n`);
		// The database may already be open (a bad pricing setting): close it, releasing the lock.
		await closeDb().catch(() => {});
		process.exit(code);
	}
	process.once('sveltekit:shutdown', () => {
		mail?.stop();
		void stopPricing();
		void closeDb();
	});
};

const handleSession: Handle = async ({ event, resolve }) => {
	const { user, sessionId } = await resolveCaller(event);
	event.locals.user = user;
	event.locals.sessionId = sessionId;
	return resolve(event);
};

/**
 * One place decides who may open what (ACCESS in $lib/roles); each load and endpoint checks
 * again. It judges the route SvelteKit matched (`event.route.id`, decoded and set before
 * `handle` runs), never the raw path, and fails closed: a route with no row is refused.
 */
export const guardRoutes: Handle = async ({ event, resolve }) => {
	const path = event.url.pathname;
	const routeId = event.route.id;
	const access = routeId === null ? undefined : rolesForRoute(routeId);
	if (access === PUBLIC || (routeId === null && isPublicFile(path))) return resolve(event);
	const user = event.locals.user;
	const isApi = (routeId === null ? path : routePattern(routeId)).startsWith('/api/');
	// Signed out: sign in first, whether or not the path leads anywhere, so a stranger learns
	// nothing about which routes exist.
	if (!user) {
		if (isApi) error(401, 'Sign in first, or send an API token as "Authorization: Bearer …".');
		redirect(303, `/sign-in?next=${encodeURIComponent(path + event.url.search)}`);
	}
	// Signed in and no route: SvelteKit answers 404; there is nothing behind it to guard.
	if (routeId === null) return resolve(event);
	if (!access || !access.includes(user.role)) {
		error(403, `Your role (${user.role}) can't open this page.`);
	}
	// Bearer tokens are for the API only; a token never opens the app's pages.
	if (user.via === 'token' && !isApi) error(403, 'API tokens open the API only.');
	// Cross-origin JSON writes: kit's csrf check covers forms only.
	if (isApi && !['GET', 'HEAD', 'OPTIONS'].includes(event.request.method)) {
		const origin = event.request.headers.get('origin');
		if (user.via === 'session' && origin && origin !== event.url.origin) {
			error(403, 'Cross-origin requests are refused.');
		}
	}
	return resolve(event);
};

export const handle = sequence(handleSession, guardRoutes);

export const handleError: HandleServerError = ({ error: err, status, message }) => {
	const errorId = crypto.randomUUID().slice(0, 8);
	if (status >= 500) console.error(`[${errorId}]`, err);
	return { message: status >= 500 ? 'Something went wrong on our side.' : message, errorId };
};
