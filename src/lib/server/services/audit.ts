import { and, count, desc, eq, gte, isNull, lt, sql, type SQL } from 'drizzle-orm';
import type { AuditKind, AuditRow } from '../../audit';
import type { EstimateStatus } from '../../estimate-status';
import type { Db } from '../db';
import { auditLog, users } from '../db/schema';
import type { DbTx } from '../mail/outbox';

/** Who made a change: a signed-in member by id, or a named party without an account. */
export type AuditActor = { userId: string } | { userId: null; name: string };

export type AuditEntry = {
	kind: AuditKind;
	action: string;
	subjectId?: string | null;
	summary: string;
	detail?: Record<string, unknown>;
};

/**
 * Adds one row to the audit log. Call it with the transaction that makes the change, so the
 * change and its record commit or roll back together. The member's name is read in the same
 * transaction and kept, so the row reads the same after a rename.
 */
export async function recordAudit(
	tx: Db | DbTx,
	companyId: string,
	actor: AuditActor,
	entry: AuditEntry
): Promise<void> {
	let actorName: string;
	if (!('name' in actor)) {
		const [u] = await tx
			.select({ name: users.name })
			.from(users)
			.where(and(eq(users.id, actor.userId), eq(users.companyId, companyId)));
		actorName = u?.name ?? 'A former member';
	} else actorName = actor.name;
	await tx.insert(auditLog).values({
		companyId,
		actorId: actor.userId,
		actorName,
		kind: entry.kind,
		action: entry.action,
		subjectId: entry.subjectId ?? null,
		summary: entry.summary,
		detail: entry.detail ?? {}
	});
}

export type AuditFilters = {
	/** A member's id, or 'none' for changes made without an account (customer, payment service). */
	actor?: string;
	kind?: AuditKind;
	/** Calendar days (YYYY-MM-DD, UTC), both included. */
	from?: string;
	to?: string;
	page: number;
	pageSize: number;
};

const nextDay = (d: string) => new Date(Date.parse(`${d}T00:00:00Z`) + 86_400_000);

/** The company's audit rows, newest first, one page at a time. */
export async function listAudit(
	db: Db,
	companyId: string,
	f: AuditFilters
): Promise<{ items: AuditRow[]; total: number; page: number; pageSize: number }> {
	const where: SQL[] = [eq(auditLog.companyId, companyId)];
	if (f.actor === 'none') where.push(isNull(auditLog.actorId));
	else if (f.actor) where.push(eq(auditLog.actorId, f.actor));
	if (f.kind) where.push(eq(auditLog.kind, f.kind));
	if (f.from) where.push(gte(auditLog.at, new Date(`${f.from}T00:00:00Z`)));
	if (f.to) where.push(lt(auditLog.at, nextDay(f.to)));
	const cond = and(...where);
	const [[{ n }], rows] = await Promise.all([
		db.select({ n: count() }).from(auditLog).where(cond),
		db
			.select()
			.from(auditLog)
			.where(cond)
			// Rows of one transaction share `at` (now() is the transaction's start): id keeps the order stable.
			.orderBy(desc(auditLog.at), desc(auditLog.id))
			.limit(f.pageSize)
			.offset((f.page - 1) * f.pageSize)
	]);
	return {
		total: n,
		page: f.page,
		pageSize: f.pageSize,
		items: rows.map((r) => ({
			id: r.id,
			at: r.at.toISOString(),
			actorName: r.actorName,
			kind: r.kind as AuditKind,
			action: r.action,
			summary: r.summary,
			subjectId: r.subjectId,
			detail: r.detail as Record<string, unknown>
		}))
	};
}

/** Everyone who appears in the company's log, for the "who" filter (members no longer listed included). */
export async function auditActors(
	db: Db,
	companyId: string
): Promise<{ id: string; name: string }[]> {
	const rows = await db
		.selectDistinctOn([auditLog.actorId], { id: auditLog.actorId, name: auditLog.actorName })
		.from(auditLog)
		.where(and(eq(auditLog.companyId, companyId), sql`${auditLog.actorId} is not null`))
		.orderBy(auditLog.actorId, desc(auditLog.at));
	const team = await db
		.select({ id: users.id, name: users.name })
		.from(users)
		.where(eq(users.companyId, companyId));
	const byId = new Map<string, string>();
	for (const u of team) byId.set(u.id, u.name);
	for (const r of rows) if (r.id && !byId.has(r.id)) byId.set(r.id, r.name);
	return [...byId].map(([id, name]) => ({ id, name })).sort((a, b) => a.name.localeCompare(b.name));
}

/** The row of an estimate's move, written by every service that moves one, in its transaction. */
export function auditStatus(
	tx: Db | DbTx,
	companyId: string,
	actor: AuditActor,
	estimateId: string,
	from: EstimateStatus,
	to: EstimateStatus,
	why?: string
): Promise<void> {
	return recordAudit(tx, companyId, actor, {
		kind: 'estimate',
		action: 'status',
		subjectId: estimateId,
		summary: `Moved an estimate from ${from} to ${to}` + (why ? ` (${why})` : ''),
		detail: { from, to }
	});
}
