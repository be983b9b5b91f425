import { and, asc, eq, gte, inArray, isNull, lte, or, sql } from 'drizzle-orm';
import type { Role } from '../../roles';
import type { EstimateInput, EstimateResult } from '../../estimating/types';
import {
	isClosed,
	type CrewMember,
	type JobHistoryEntry,
	type JobLogState,
	type JobStatus,
	type WeekJob
} from '../../types/job';
import { checkDone, checklistItems, EMPTY_LOG } from '../../jobs/checklist';
import { addDays } from '../../jobs/week';
import type { JobLogBody } from '../../schemas/job';
import { getDb, type Db } from '../db';
import { customers, estimates, jobLogs, jobs, sites, users, type SiteFlags } from '../db/schema';
import { Conflict, Forbidden, Invalid, NotFound } from './errors';
import { issueFinalInvoice, trySendNow } from './balance';
import { countAfterPhotos } from './job-photos';
import { mailJobChange } from './job-mail';
import { auditStatus } from './audit';

export type Caller = { id: string; companyId: string; role: Role; name: string };

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

type Plan = { date: string | null; windowStart: string; windowEnd: string; crewIds: string[] };

/** Active team members with the crew role: the only people a job can be given to. */
export async function listCrew(companyId: string): Promise<CrewMember[]> {
	const db = await getDb();
	return db
		.select({ id: users.id, name: users.name })
		.from(users)
		.where(and(eq(users.companyId, companyId), eq(users.role, 'crew'), eq(users.active, true)))
		.orderBy(asc(users.name));
}

async function assertCrew(tx: Tx, companyId: string, ids: readonly string[]) {
	const found = await tx
		.select({ id: users.id })
		.from(users)
		.where(
			and(
				eq(users.companyId, companyId),
				eq(users.role, 'crew'),
				eq(users.active, true),
				inArray(users.id, [...ids])
			)
		);
	if (found.length !== ids.length) {
		throw Invalid.of([
			{ path: 'crewIds', message: 'Pick crew from your team members with the crew role.' }
		]);
	}
}

export type Schedulable = { id: string; address: string; customerName: string; hours: number };

/** Accepted estimates that have no job yet. */
export async function listSchedulable(companyId: string): Promise<Schedulable[]> {
	const db = await getDb();
	const rows = await db
		.select({
			id: estimates.id,
			address: sites.address,
			customerName: customers.name,
			hours: sql<number>`(${estimates.result}->'labour'->>'hours')::float8`
		})
		.from(estimates)
		.innerJoin(sites, eq(sites.id, estimates.siteId))
		.innerJoin(customers, eq(customers.id, sites.customerId))
		.leftJoin(jobs, eq(jobs.estimateId, estimates.id))
		.where(
			and(eq(estimates.companyId, companyId), eq(estimates.status, 'accepted'), isNull(jobs.id))
		)
		.orderBy(asc(sites.address));
	return rows;
}

function entry(
	kind: JobHistoryEntry['kind'],
	caller: Caller,
	plan: Plan,
	extra: Partial<JobHistoryEntry> = {}
): JobHistoryEntry {
	return { kind, at: new Date().toISOString(), byName: caller.name, ...plan, ...extra };
}

/**
 * Schedules an accepted estimate: the job row, its first history entry and the estimate's move
 * to `scheduled` in one transaction, conditional on the estimate still being accepted (two
 * people scheduling the same estimate at once: one wins, the other gets 409). Then the customer
 * is e-mailed through the outbox.
 */
export async function scheduleJob(
	caller: Caller,
	input: {
		estimateId: string;
		date: string;
		windowStart: string;
		windowEnd: string;
		crewIds: string[];
	}
): Promise<{ jobId: string; mail: string }> {
	const db = await getDb();
	const plan: Plan = {
		date: input.date,
		windowStart: input.windowStart,
		windowEnd: input.windowEnd,
		crewIds: input.crewIds
	};
	const jobId = await db.transaction(async (tx) => {
		const [est] = await tx
			.select({ status: estimates.status, result: estimates.result })
			.from(estimates)
			.where(and(eq(estimates.id, input.estimateId), eq(estimates.companyId, caller.companyId)));
		if (!est) throw new NotFound(`No estimate with id ${input.estimateId}.`);
		if (est.status !== 'accepted') {
			throw new Conflict(`Only an accepted estimate can be scheduled; this one is ${est.status}.`, [
				{ path: 'estimateId', message: `The estimate is ${est.status}, not accepted.` }
			]);
		}
		await assertCrew(tx, caller.companyId, plan.crewIds);
		const moved = await tx
			.update(estimates)
			.set({ status: 'scheduled' })
			.where(and(eq(estimates.id, input.estimateId), eq(estimates.status, 'accepted')))
			.returning({ id: estimates.id });
		if (!moved.length)
			throw new Conflict('Someone changed this estimate at the same time; reload.');
		await auditStatus(
			tx,
			caller.companyId,
			{ userId: caller.id },
			input.estimateId,
			'accepted',
			'scheduled',
			`job on ${input.date}`
		);
		const [row] = await tx
			.insert(jobs)
			.values({
				companyId: caller.companyId,
				estimateId: input.estimateId,
				...plan,
				expectedHours: (est.result as EstimateResult).labour.hours,
				history: [entry('scheduled', caller, plan)],
				scheduledBy: caller.id
			})
			.returning({ id: jobs.id });
		return row.id;
	});
	return { jobId, mail: await mailJobChange(caller.companyId, jobId, 'scheduled') };
}

async function jobRow(tx: Tx, companyId: string, jobId: string) {
	const [j] = await tx
		.select()
		.from(jobs)
		.where(and(eq(jobs.id, jobId), eq(jobs.companyId, companyId)));
	if (!j) throw new NotFound(`No job with id ${jobId}.`);
	return j;
}

function assertOpen(j: { status: JobStatus; revision: number }, revision: number) {
	if (isClosed(j.status)) {
		throw new Conflict('This job is done; it can no longer be moved.');
	}
	if (j.revision !== revision) {
		throw new Conflict(
			'Someone changed this job since you opened the schedule; reload and try again.'
		);
	}
}

const planOf = (j: typeof jobs.$inferSelect): Plan => ({
	date: j.date,
	windowStart: j.windowStart,
	windowEnd: j.windowEnd,
	crewIds: j.crewIds
});

/**
 * Gives a job a new date, window or crew. The change is appended to the history (with the plan
 * it replaced), the revision goes up, and the customer gets an e-mail keyed by that revision.
 */
export async function moveJob(
	caller: Caller,
	input: {
		jobId: string;
		revision: number;
		date: string;
		windowStart: string;
		windowEnd: string;
		crewIds: string[];
	}
): Promise<{ mail: string }> {
	const db = await getDb();
	const plan: Plan = {
		date: input.date,
		windowStart: input.windowStart,
		windowEnd: input.windowEnd,
		crewIds: input.crewIds
	};
	await db.transaction(async (tx) => {
		const j = await jobRow(tx, caller.companyId, input.jobId);
		assertOpen(j, input.revision);
		await assertCrew(tx, caller.companyId, plan.crewIds);
		await appendChange(
			tx,
			j,
			{ ...plan, status: 'scheduled' },
			entry('moved', caller, plan, { from: planOf(j) })
		);
	});
	return { mail: await mailJobChange(caller.companyId, input.jobId, 'moved') };
}

/**
 * Postpones a job for a reason, to a new date (same window and crew) or with none yet. The
 * history keeps the date it had and the reason; nothing is overwritten.
 */
export async function postponeJob(
	caller: Caller,
	input: { jobId: string; revision: number; reason: string; newDate: string | null }
): Promise<{ mail: string }> {
	const db = await getDb();
	await db.transaction(async (tx) => {
		const j = await jobRow(tx, caller.companyId, input.jobId);
		assertOpen(j, input.revision);
		const plan: Plan = { ...planOf(j), date: input.newDate };
		await appendChange(
			tx,
			j,
			{ ...plan, status: input.newDate ? 'scheduled' : 'postponed' },
			entry('postponed', caller, plan, { from: planOf(j), reason: input.reason })
		);
	});
	return { mail: await mailJobChange(caller.companyId, input.jobId, 'postponed') };
}

async function appendChange(
	tx: Tx,
	j: typeof jobs.$inferSelect,
	next: Plan & { status: JobStatus },
	e: JobHistoryEntry
) {
	// The history is appended in SQL (jsonb ||), conditional on the revision read: a concurrent
	// change can't be lost between the read and the write.
	const done = await tx
		.update(jobs)
		.set({
			...next,
			revision: j.revision + 1,
			history: sql`${jobs.history} || ${JSON.stringify([e])}::jsonb`
		})
		.where(and(eq(jobs.id, j.id), eq(jobs.revision, j.revision)))
		.returning({ id: jobs.id });
	if (!done.length)
		throw new Conflict('Someone changed this job at the same time; reload and try again.');
}

function weekJob(r: {
	j: typeof jobs.$inferSelect;
	address: string;
	customerName: string;
}): WeekJob {
	return {
		id: r.j.id,
		estimateId: r.j.estimateId,
		status: r.j.status,
		date: r.j.date,
		windowStart: r.j.windowStart,
		windowEnd: r.j.windowEnd,
		expectedHours: r.j.expectedHours,
		crewIds: r.j.crewIds,
		address: r.address,
		customerName: r.customerName,
		revision: r.j.revision
	};
}

/** The week from `monday`, plus every postponed job still waiting for a date. */
export async function listWeek(companyId: string, monday: string): Promise<WeekJob[]> {
	const db = await getDb();
	const rows = await db
		.select({ j: jobs, address: sites.address, customerName: customers.name })
		.from(jobs)
		.innerJoin(estimates, eq(estimates.id, jobs.estimateId))
		.innerJoin(sites, eq(sites.id, estimates.siteId))
		.innerJoin(customers, eq(customers.id, sites.customerId))
		.where(
			and(
				eq(jobs.companyId, companyId),
				or(
					and(gte(jobs.date, monday), lte(jobs.date, addDays(monday, 6))),
					eq(jobs.status, 'postponed')
				)
			)
		)
		.orderBy(asc(jobs.date), asc(jobs.windowStart));
	return rows.map(weekJob);
}

/** Jobs on a crew sheet list: the crew member's own, or every open and recent one for the owner. */
export async function listSheets(caller: Caller, from: string): Promise<WeekJob[]> {
	const db = await getDb();
	const rows = await db
		.select({ j: jobs, address: sites.address, customerName: customers.name })
		.from(jobs)
		.innerJoin(estimates, eq(estimates.id, jobs.estimateId))
		.innerJoin(sites, eq(sites.id, estimates.siteId))
		.innerJoin(customers, eq(customers.id, sites.customerId))
		.where(
			and(
				eq(jobs.companyId, caller.companyId),
				or(gte(jobs.date, from), eq(jobs.status, 'scheduled'), eq(jobs.status, 'postponed')),
				caller.role === 'crew' ? sql`${caller.id}::uuid = any(${jobs.crewIds})` : undefined
			)
		)
		// Open jobs first (soonest on top), then the done ones.
		.orderBy(sql`${jobs.status} in ('done', 'paid')`, asc(jobs.date), asc(jobs.windowStart));
	return rows.map(weekJob);
}

export interface CrewSheet {
	job: WeekJob & { history: JobHistoryEntry[]; doneAt: Date | null };
	crew: CrewMember[];
	site: {
		address: string;
		lat: number;
		lon: number;
		gateCode: string | null;
		pets: string | null;
		waterSource: string | null;
		notes: string;
		flags: SiteFlags;
	};
	input: EstimateInput;
	result: EstimateResult;
	log: JobLogState & { doneReason: string | null; updatedAt: Date | null };
	afterPhotos: number;
}

/**
 * One job's crew sheet. Crew see only the jobs they are on: any other job answers as if it did
 * not exist (404), so a sheet's address and gate code reach only its own crew and the owner.
 */
export async function getSheet(caller: Caller, jobId: string): Promise<CrewSheet> {
	const db = await getDb();
	const [r] = await db
		.select({
			j: jobs,
			address: sites.address,
			customerName: customers.name,
			site: sites,
			input: estimates.input,
			result: estimates.result
		})
		.from(jobs)
		.innerJoin(estimates, eq(estimates.id, jobs.estimateId))
		.innerJoin(sites, eq(sites.id, estimates.siteId))
		.innerJoin(customers, eq(customers.id, sites.customerId))
		.where(and(eq(jobs.id, jobId), eq(jobs.companyId, caller.companyId)));
	if (!r || !mayWork(caller, r.j.crewIds)) throw new NotFound(`No job with id ${jobId}.`);
	const [log] = await db.select().from(jobLogs).where(eq(jobLogs.jobId, jobId));
	const crew = await db
		.select({ id: users.id, name: users.name })
		.from(users)
		.where(and(eq(users.companyId, caller.companyId), inArray(users.id, r.j.crewIds)));
	const s = r.site;
	return {
		job: { ...weekJob(r), history: r.j.history, doneAt: r.j.doneAt },
		crew,
		site: {
			address: s.address,
			lat: s.lat,
			lon: s.lon,
			gateCode: s.gateCode,
			pets: s.pets,
			waterSource: s.waterSource,
			notes: s.notes,
			flags: s.flags
		},
		input: r.input as EstimateInput,
		result: r.result as EstimateResult,
		log: log
			? {
					checklist: log.checklist,
					stockGalUsed: log.stockGalUsed,
					surfactantOzUsed: log.surfactantOzUsed,
					measuredStockPct: log.measuredStockPct,
					notes: log.notes,
					doneReason: log.doneReason,
					updatedAt: log.updatedAt
				}
			: { ...EMPTY_LOG, doneReason: null, updatedAt: null },
		afterPhotos: await countAfterPhotos(caller.companyId, jobId)
	};
}

/** A job as the API shows it, or undefined when the caller may not see it. */
export async function getJob(caller: Caller, jobId: string) {
	const db = await getDb();
	const [r] = await db
		.select({ j: jobs, address: sites.address, customerName: customers.name })
		.from(jobs)
		.innerJoin(estimates, eq(estimates.id, jobs.estimateId))
		.innerJoin(sites, eq(sites.id, estimates.siteId))
		.innerJoin(customers, eq(customers.id, sites.customerId))
		.where(and(eq(jobs.id, jobId), eq(jobs.companyId, caller.companyId)));
	if (!r) return undefined;
	if (caller.role !== 'sales' && !mayWork(caller, r.j.crewIds)) return undefined;
	const [log] = await db.select().from(jobLogs).where(eq(jobLogs.jobId, jobId));
	return {
		...weekJob(r),
		history: r.j.history,
		doneAt: r.j.doneAt,
		log: log
			? {
					checklist: log.checklist,
					stockGalUsed: log.stockGalUsed,
					surfactantOzUsed: log.surfactantOzUsed,
					measuredStockPct: log.measuredStockPct,
					notes: log.notes,
					doneReason: log.doneReason,
					updatedAt: log.updatedAt
				}
			: null
	};
}

function mayWork(caller: Caller, crewIds: readonly string[]): boolean {
	if (caller.role === 'owner') return true;
	return caller.role === 'crew' && crewIds.includes(caller.id);
}

/**
 * Stores what a device sends for a job's log. Devices queue changes while offline and send
 * them later, so a write older than the stored one (by the device's clock) is ignored rather
 * than allowed to undo newer ticks; the answer says which happened.
 */
export async function saveLog(
	caller: Caller,
	jobId: string,
	body: JobLogBody
): Promise<{ stored: boolean; log: JobLogState }> {
	const db = await getDb();
	return db.transaction(async (tx) => {
		const j = await jobRow(tx, caller.companyId, jobId);
		if (!mayWork(caller, j.crewIds)) throw new NotFound(`No job with id ${jobId}.`);
		if (isClosed(j.status)) {
			throw new Conflict('This job is done; its log can no longer change.');
		}
		const at = new Date(body.clientUpdatedAt);
		const values = {
			checklist: body.checklist,
			stockGalUsed: body.stockGalUsed,
			surfactantOzUsed: body.surfactantOzUsed,
			measuredStockPct: body.measuredStockPct,
			notes: body.notes,
			clientUpdatedAt: at,
			updatedBy: caller.id
		};
		const [stored] = await tx
			.insert(jobLogs)
			.values({ companyId: caller.companyId, jobId, ...values })
			.onConflictDoUpdate({
				target: jobLogs.jobId,
				set: values,
				setWhere: sql`${jobLogs.clientUpdatedAt} is null or ${jobLogs.clientUpdatedAt} <= ${at.toISOString()}::timestamptz`
			})
			.returning({ id: jobLogs.id });
		const [now] = await tx.select().from(jobLogs).where(eq(jobLogs.jobId, jobId));
		return {
			stored: Boolean(stored),
			log: {
				checklist: now.checklist,
				stockGalUsed: now.stockGalUsed,
				surfactantOzUsed: now.surfactantOzUsed,
				measuredStockPct: now.measuredStockPct,
				notes: now.notes
			}
		};
	});
}

/**
 * Marks a job done (and its estimate `done`): refused (Invalid, with what is missing) unless the
 * whole checklist is ticked and there is at least one after photo, or a reason is given. The
 * final invoice is issued and e-mailed with it (services/balance.ts).
 */
export async function markDone(
	caller: Caller,
	jobId: string,
	reason: string | null,
	linkBase: string
): Promise<{ invoiceId: string }> {
	if (caller.role !== 'owner' && caller.role !== 'crew') {
		throw new Forbidden('Only the crew on the job or the owner can mark it done.');
	}
	const db = await getDb();
	const sheet = await getSheet(caller, jobId);
	if (isClosed(sheet.job.status)) {
		throw new Conflict('This job is already done.');
	}
	if (sheet.job.status !== 'scheduled') {
		throw new Conflict('A postponed job needs a date before it can be done.');
	}
	const items = checklistItems(
		sheet.result.facets.map((f, i) => ({ id: f.id, n: i + 1, label: f.label }))
	);
	const check = checkDone({ items, log: sheet.log, afterPhotos: sheet.afterPhotos, reason });
	if (!check.ok) {
		// A field refusal (400): in this state the reason is what the form is missing.
		throw new Invalid(
			`Not done yet: ${check.missing.join('; ')}. Tick the checklist and add an after photo, or give a reason.`,
			check.missing.map((m) => ({ path: 'reason', message: m }))
		);
	}
	const made = await db.transaction(async (tx) => {
		const j = await jobRow(tx, caller.companyId, jobId);
		const moved = await tx
			.update(estimates)
			.set({ status: 'done' })
			.where(and(eq(estimates.id, j.estimateId), eq(estimates.status, 'scheduled')))
			.returning({ id: estimates.id });
		if (!moved.length) throw new Conflict('The estimate is no longer scheduled; reload.');
		await auditStatus(
			tx,
			caller.companyId,
			{ userId: caller.id },
			j.estimateId,
			'scheduled',
			'done',
			reason ? `done with a reason: ${reason}` : 'job done'
		);
		const e = entry('done', caller, planOf(j), reason ? { reason } : {});
		await tx
			.update(jobs)
			.set({
				status: 'done',
				doneAt: new Date(),
				history: sql`${jobs.history} || ${JSON.stringify([e])}::jsonb`
			})
			.where(and(eq(jobs.id, jobId), eq(jobs.status, 'scheduled')));
		await tx
			.insert(jobLogs)
			.values({ companyId: caller.companyId, jobId, doneReason: reason, updatedBy: caller.id })
			.onConflictDoUpdate({ target: jobLogs.jobId, set: { doneReason: reason } });
		// The balance is invoiced with the move to done: both commit, or neither.
		return issueFinalInvoice(tx, caller, j.estimateId, linkBase);
	});
	await trySendNow(made.mailId);
	return { invoiceId: made.invoiceId };
}
