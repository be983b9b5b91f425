import { and, asc, eq, isNull, ne } from 'drizzle-orm';
import type { Role } from '$lib/roles';
import { getDb } from '../db';
import { apiTokens, sessions, users } from '../db/schema';
import { dummyHash, hashPassword, verifyPassword } from '../auth/password';
import { hashApiToken, newApiToken } from '../auth/tokens';
import { recordAudit } from './audit';

export class TeamError extends Error {
	constructor(
		message: string,
		readonly field?: string
	) {
		super(message);
	}
}

/** Same work and same answer for an unknown e-mail as for a wrong password. */
export async function checkCredentials(email: string, password: string) {
	const db = await getDb();
	const [user] = await db.select().from(users).where(eq(users.email, email)).limit(1);
	const ok = await verifyPassword(user?.passwordHash ?? (await dummyHash()), password);
	if (!user || !ok || !user.active) return null;
	return user;
}

export type TeamMember = {
	id: string;
	name: string;
	email: string;
	role: Role;
	active: boolean;
	createdAt: Date;
};

export async function listTeam(companyId: string): Promise<TeamMember[]> {
	const db = await getDb();
	return db
		.select({
			id: users.id,
			name: users.name,
			email: users.email,
			role: users.role,
			active: users.active,
			createdAt: users.createdAt
		})
		.from(users)
		.where(eq(users.companyId, companyId))
		.orderBy(asc(users.name));
}

export async function inviteUser(
	companyId: string,
	input: { name: string; email: string; role: Role; password: string },
	actorId: string
) {
	const db = await getDb();
	const [taken] = await db.select({ id: users.id }).from(users).where(eq(users.email, input.email));
	if (taken) throw new TeamError('Someone already has that e-mail address.', 'email');
	const passwordHash = await hashPassword(input.password);
	return db.transaction(async (tx) => {
		const [row] = await tx
			.insert(users)
			.values({ companyId, name: input.name, email: input.email, role: input.role, passwordHash })
			.returning({ id: users.id });
		await recordAudit(
			tx,
			companyId,
			{ userId: actorId },
			{
				kind: 'team',
				action: 'invited',
				subjectId: row.id,
				summary: `Invited ${input.name} (${input.email}) as ${input.role}`,
				detail: { name: input.name, email: input.email, role: input.role }
			}
		);
		return row.id;
	});
}

async function memberOf(companyId: string, userId: string) {
	const db = await getDb();
	const [u] = await db
		.select()
		.from(users)
		.where(and(eq(users.id, userId), eq(users.companyId, companyId)));
	if (!u) throw new TeamError('No such team member.');
	return u;
}

/** The company must keep at least one active owner, or nobody can manage it. */
async function assertOtherOwner(companyId: string, userId: string) {
	const db = await getDb();
	const owners = await db
		.select({ id: users.id })
		.from(users)
		.where(
			and(
				eq(users.companyId, companyId),
				eq(users.role, 'owner'),
				eq(users.active, true),
				ne(users.id, userId)
			)
		);
	if (owners.length === 0) throw new TeamError('The company needs at least one active owner.');
}

export async function setRole(companyId: string, userId: string, role: Role, actorId: string) {
	const u = await memberOf(companyId, userId);
	if (u.role === role) return;
	if (u.role === 'owner' && role !== 'owner') await assertOtherOwner(companyId, userId);
	const db = await getDb();
	await db.transaction(async (tx) => {
		await tx.update(users).set({ role }).where(eq(users.id, userId));
		await recordAudit(
			tx,
			companyId,
			{ userId: actorId },
			{
				kind: 'team',
				action: 'role',
				subjectId: userId,
				summary: `Changed ${u.name}'s role from ${u.role} to ${role}`,
				detail: { name: u.name, from: u.role, to: role }
			}
		);
	});
}

/** Deactivating ends every session and API token the user has at once. */
export async function setActive(
	companyId: string,
	userId: string,
	active: boolean,
	actorId: string
) {
	const u = await memberOf(companyId, userId);
	if (!active && u.role === 'owner') await assertOtherOwner(companyId, userId);
	const db = await getDb();
	await db.transaction(async (tx) => {
		await tx.update(users).set({ active }).where(eq(users.id, userId));
		if (!active) {
			await tx.delete(sessions).where(eq(sessions.userId, userId));
			await tx.update(apiTokens).set({ revokedAt: new Date() }).where(eq(apiTokens.userId, userId));
		}
		// Deactivating again still ends sessions (one may have been made since); only a change is logged.
		if (u.active !== active) {
			await recordAudit(
				tx,
				companyId,
				{ userId: actorId },
				{
					kind: 'team',
					action: active ? 'reactivated' : 'deactivated',
					subjectId: userId,
					summary: active
						? `Reactivated ${u.name}`
						: `Deactivated ${u.name}; their sessions and API tokens ended`,
					detail: { name: u.name }
				}
			);
		}
	});
}

/** Changing a password ends the user's other sessions (ASVS 7.4.3); this one stays. */
export async function changePassword(
	userId: string,
	currentSessionId: string | null,
	current: string,
	next: string
) {
	const db = await getDb();
	const [u] = await db.select().from(users).where(eq(users.id, userId));
	if (!u || !(await verifyPassword(u.passwordHash, current))) {
		throw new TeamError('Your current password is not right.', 'current');
	}
	const passwordHash = await hashPassword(next);
	await db.transaction(async (tx) => {
		await tx.update(users).set({ passwordHash }).where(eq(users.id, userId));
		await recordAudit(
			tx,
			u.companyId,
			{ userId },
			{
				kind: 'team',
				action: 'password',
				subjectId: userId,
				summary: `${u.name} changed their password; their other sessions ended`
			}
		);
		await tx
			.delete(sessions)
			.where(
				currentSessionId
					? and(eq(sessions.userId, userId), ne(sessions.id, currentSessionId))
					: eq(sessions.userId, userId)
			);
	});
}

export async function listTokens(companyId: string) {
	const db = await getDb();
	return db
		.select({
			id: apiTokens.id,
			name: apiTokens.name,
			userName: users.name,
			lastUsedAt: apiTokens.lastUsedAt,
			revokedAt: apiTokens.revokedAt,
			createdAt: apiTokens.createdAt
		})
		.from(apiTokens)
		.innerJoin(users, eq(users.id, apiTokens.userId))
		.where(eq(apiTokens.companyId, companyId))
		.orderBy(asc(apiTokens.createdAt));
}

/** Returns the token once; only its hash is kept. It acts with its creator's role. */
export async function createToken(companyId: string, userId: string, name: string) {
	const token = newApiToken();
	const db = await getDb();
	await db.transaction(async (tx) => {
		const [row] = await tx
			.insert(apiTokens)
			.values({ companyId, userId, name, tokenHash: hashApiToken(token) })
			.returning({ id: apiTokens.id });
		await recordAudit(
			tx,
			companyId,
			{ userId },
			{
				kind: 'token',
				action: 'created',
				subjectId: row.id,
				summary: `Created the API token "${name}"`,
				detail: { name }
			}
		);
	});
	return token;
}

export async function revokeToken(companyId: string, tokenId: string, actorId: string) {
	const db = await getDb();
	await db.transaction(async (tx) => {
		const [row] = await tx
			.update(apiTokens)
			.set({ revokedAt: new Date() })
			.where(
				and(
					eq(apiTokens.id, tokenId),
					eq(apiTokens.companyId, companyId),
					isNull(apiTokens.revokedAt)
				)
			)
			.returning({ id: apiTokens.id, name: apiTokens.name });
		if (!row) return;
		await recordAudit(
			tx,
			companyId,
			{ userId: actorId },
			{
				kind: 'token',
				action: 'revoked',
				subjectId: row.id,
				summary: `Revoked the API token "${row.name}"`,
				detail: { name: row.name }
			}
		);
	});
}
