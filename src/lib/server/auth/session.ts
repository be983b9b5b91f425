import type { Cookies, RequestEvent } from '@sveltejs/kit';
import { and, eq, isNull } from 'drizzle-orm';
import { getDb } from '../db';
import { apiTokens, users } from '../db/schema';
import { getLucia } from './lucia';
import { hashApiToken, hashSessionToken, newSessionToken } from './tokens';

export type LocalUser = {
	id: string;
	email: string;
	name: string;
	role: App.Role;
	companyId: string;
	via: 'session' | 'token';
};

export async function startSession(cookies: Cookies, userId: string, companyId: string) {
	const lucia = await getLucia();
	// The cookie carries the token; the database keeps only its hash as the session id,
	// so a leaked table holds no live sessions.
	const token = newSessionToken();
	const session = await lucia.createSession(
		userId,
		{ companyId },
		{ sessionId: hashSessionToken(token) }
	);
	const cookie = lucia.createSessionCookie(token);
	cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
	return session;
}

export async function endSession(cookies: Cookies, sessionId: string | undefined) {
	const lucia = await getLucia();
	if (sessionId) await lucia.invalidateSession(sessionId);
	const blank = lucia.createBlankSessionCookie();
	cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
}

/** Resolves the caller from the session cookie or a bearer token. */
export async function resolveCaller(
	event: RequestEvent
): Promise<{ user: LocalUser | null; sessionId: string | null }> {
	const bearer = event.request.headers.get('authorization');
	if (bearer?.toLowerCase().startsWith('bearer ')) {
		return { user: await userFromToken(bearer.slice(7).trim()), sessionId: null };
	}
	const lucia = await getLucia();
	const token = event.cookies.get(lucia.sessionCookieName);
	if (!token) return { user: null, sessionId: null };
	const { session, user } = await lucia.validateSession(hashSessionToken(token));
	if (!session || !user || !user.active) {
		if (session) await lucia.invalidateSession(session.id);
		const blank = lucia.createBlankSessionCookie();
		event.cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
		return { user: null, sessionId: null };
	}
	if (session.fresh) {
		const cookie = lucia.createSessionCookie(token);
		event.cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
	}
	return {
		user: {
			id: user.id,
			email: user.email,
			name: user.name,
			role: user.role,
			companyId: user.companyId,
			via: 'session'
		},
		sessionId: session.id
	};
}

async function userFromToken(token: string): Promise<LocalUser | null> {
	if (!token) return null;
	const db = await getDb();
	const [row] = await db
		.select({ tokenId: apiTokens.id, lastUsedAt: apiTokens.lastUsedAt, user: users })
		.from(apiTokens)
		.innerJoin(users, eq(users.id, apiTokens.userId))
		.where(and(eq(apiTokens.tokenHash, hashApiToken(token)), isNull(apiTokens.revokedAt)))
		.limit(1);
	if (!row || !row.user.active) return null;
	// At most one write a minute per token, so API calls stay reads.
	if (!row.lastUsedAt || Date.now() - row.lastUsedAt.getTime() > 60_000) {
		await db.update(apiTokens).set({ lastUsedAt: new Date() }).where(eq(apiTokens.id, row.tokenId));
	}
	const u = row.user;
	return {
		id: u.id,
		email: u.email,
		name: u.name,
		role: u.role,
		companyId: u.companyId,
		via: 'token'
	};
}
