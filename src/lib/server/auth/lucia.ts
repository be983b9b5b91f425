import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { Lucia, TimeSpan } from 'lucia';
import { getDb } from '../db';
import { sessions, users } from '../db/schema';
import { env } from '../env';
import type { Role } from '$lib/roles';

function create(db: Awaited<ReturnType<typeof getDb>>) {
	const adapter = new DrizzlePostgreSQLAdapter(db, sessions, users);
	return new Lucia(adapter, {
		// Lucia renews the session when half of this has elapsed: sliding expiry.
		sessionExpiresIn: new TimeSpan(14, 'd'),
		sessionCookie: {
			name: 'cp_session',
			attributes: { secure: env.secureCookies, sameSite: 'lax' }
		},
		getUserAttributes: (row) => ({
			email: row.email,
			name: row.name,
			role: row.role,
			companyId: row.companyId,
			active: row.active
		}),
		getSessionAttributes: (row) => ({ companyId: row.companyId })
	});
}

let lucia: ReturnType<typeof create> | undefined;

export async function getLucia() {
	lucia ??= create(await getDb());
	return lucia;
}

declare module 'lucia' {
	interface Register {
		Lucia: ReturnType<typeof create>;
		DatabaseUserAttributes: {
			email: string;
			name: string;
			role: Role;
			companyId: string;
			active: boolean;
		};
		DatabaseSessionAttributes: { companyId: string };
	}
}
