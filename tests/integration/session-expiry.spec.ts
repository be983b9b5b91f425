// Session expiry and sliding renewal, in-process against a fresh PGlite directory.
import path from 'node:path';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const DAY = 24 * 60 * 60 * 1000;

beforeAll(() => {
	process.env.CLEARPITCH_DATA_DIR = path.resolve(
		'tmp/data',
		`session-${process.pid}-${Date.now()}`
	);
	process.env.DATABASE_URL = '';
});

afterAll(async () => {
	const { closeDb } = await import('$lib/server/db');
	await closeDb();
});

describe('lucia sessions', () => {
	it('renews a session past half its life, and rejects an expired one', async () => {
		const { getDb } = await import('$lib/server/db');
		const { sessions } = await import('$lib/server/db/schema');
		const { getLucia } = await import('$lib/server/auth/lucia');
		const { seedDemo } = await import('$lib/server/seed/demo');
		const { checkCredentials } = await import('$lib/server/services/team');

		await seedDemo();
		const db = await getDb();
		const lucia = await getLucia();
		const user = await checkCredentials('owner@harborpine.example', 'pitch-demo-2026');
		expect(user).not.toBeNull();

		const s = await lucia.createSession(user!.id, { companyId: user!.companyId });
		// 14-day expiry (our setting); a fresh session is not renewed again at once.
		expect(s.expiresAt.getTime() - Date.now()).toBeGreaterThan(13.9 * DAY);
		const first = await lucia.validateSession(s.id);
		expect(first.session?.fresh).toBe(false);

		// With 3 days left (less than half of 14), validation slides the expiry forward.
		await db
			.update(sessions)
			.set({ expiresAt: new Date(Date.now() + 3 * DAY) })
			.where(eq(sessions.id, s.id));
		const renewed = await lucia.validateSession(s.id);
		expect(renewed.session?.fresh).toBe(true);
		expect(renewed.session!.expiresAt.getTime() - Date.now()).toBeGreaterThan(13.9 * DAY);

		// Past its expiry the session is gone for good.
		await db
			.update(sessions)
			.set({ expiresAt: new Date(Date.now() - 1000) })
			.where(eq(sessions.id, s.id));
		const expired = await lucia.validateSession(s.id);
		expect(expired.session).toBeNull();
		const left = await db.select().from(sessions).where(eq(sessions.id, s.id));
		expect(left).toHaveLength(0);
	});

	it('keeps only a hash of the cookie token in the sessions table', async () => {
		const { createHash } = await import('node:crypto');
		const { getDb } = await import('$lib/server/db');
		const { sessions } = await import('$lib/server/db/schema');
		const { startSession } = await import('$lib/server/auth/session');
		const { checkCredentials } = await import('$lib/server/services/team');
		const user = await checkCredentials('sales@harborpine.example', 'pitch-demo-2026');
		const jar = new Map<string, string>();
		const cookies = { set: (name: string, value: string) => jar.set(name, value) };
		await startSession(cookies as never, user!.id, user!.companyId);
		const token = jar.get('cp_session')!;
		expect(token.length).toBeGreaterThanOrEqual(26);
		const db = await getDb();
		const ids = (await db.select({ id: sessions.id }).from(sessions)).map((r) => r.id);
		expect(ids).not.toContain(token);
		expect(ids).toContain(createHash('sha256').update(token).digest('hex'));
	});

	it('stores argon2id hashes with at least the OWASP parameters', async () => {
		const { getDb } = await import('$lib/server/db');
		const { users } = await import('$lib/server/db/schema');
		const db = await getDb();
		const rows = await db.select({ h: users.passwordHash }).from(users);
		expect(rows.length).toBeGreaterThan(0);
		for (const { h } of rows) {
			// OWASP Password Storage Cheat Sheet: argon2id, m ≥ 19456 KiB, t ≥ 2, p ≥ 1.
			const m = h.match(/^\$argon2id\$v=19\$m=(\d+),t=(\d+),p=(\d+)\$/);
			expect(m).not.toBeNull();
			expect(Number(m![1])).toBeGreaterThanOrEqual(19456);
			expect(Number(m![2])).toBeGreaterThanOrEqual(2);
			expect(Number(m![3])).toBeGreaterThanOrEqual(1);
		}
	});
});
