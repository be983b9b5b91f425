import { and, count, desc, eq, ilike, or, sql, type SQL } from 'drizzle-orm';
import type { Role } from '../../roles';
import type { EstimateInput, EstimateResult } from '../../estimating/types';
import { Conflict, Forbidden, Invalid, NotFound } from './errors';
import type { EstimateDetail, EstimateFilters, EstimateListItem } from '../../types/estimate';
import { getDb } from '../db';
import { JOB_MOVES, legalNext, rolesForMove, type EstimateStatus } from '../../estimate-status';
import { customers, estimates, sites, users } from '../db/schema';
import { latestRateCard, NoRateCardError, rateCardById, type StoredRateCard } from './rate-cards';
import type { CardRef, PlanRef, PriceOutcome, PriceTask } from '../pricing/price-request';
import type { PlanFacet } from '../../schemas/roof-plan';
import { getPlanById } from './roof-plans';
import { runPricing } from '../pricing/pool';
import { auditStatus, recordAudit } from './audit';
import { formatCents } from '../../estimating/money';

export type { EstimateStatus };

export type Caller = { id: string; companyId: string; role: Role };

export type PricedEstimate = EstimateResult & {
	rateCard: { id: string; version: number };
	estimate?: { id: string; status: EstimateStatus };
};

async function cardFor(companyId: string, rateCardId?: string): Promise<StoredRateCard> {
	if (!rateCardId) {
		try {
			return await latestRateCard(companyId);
		} catch (e) {
			if (e instanceof NoRateCardError) throw new Conflict(e.message);
			throw e;
		}
	}
	const card = await rateCardById(companyId, rateCardId);
	if (!card) {
		throw Invalid.of([{ path: 'rateCardId', message: 'rateCardId is not one of your rate cards' }]);
	}
	return card;
}

async function assertSite(companyId: string, siteId: string) {
	const db = await getDb();
	const [site] = await db
		.select({ id: sites.id })
		.from(sites)
		.where(and(eq(sites.id, siteId), eq(sites.companyId, companyId)))
		.limit(1);
	if (!site) throw Invalid.of([{ path: 'siteId', message: 'siteId is not one of your sites' }]);
}

/**
 * The roof plan a body names, as the pricing step takes it: refused (400, roofPlanId) unless it
 * is one of the company's plans and, when the body names a site, a plan of that site.
 */
async function planFor(companyId: string, planId: string, siteId: string | null): Promise<PlanRef> {
	const plan = await getPlanById(companyId, planId);
	if (!plan) {
		throw Invalid.of([{ path: 'roofPlanId', message: 'roofPlanId is not one of your roof plans' }]);
	}
	if (siteId !== null && plan.siteId !== siteId) {
		throw Invalid.of([
			{ path: 'roofPlanId', message: 'roofPlanId is a roof plan of another site than siteId' }
		]);
	}
	return { id: plan.id, facets: plan.facets.map(toRequestFacet) };
}

/** A stored plan facet as /api/estimates takes it. */
function toRequestFacet({ geometry, label, ...f }: PlanFacet) {
	return { ...f, ...(label ? { label } : {}), geometry };
}

/** Stores a priced request as a draft for its site, frozen with its input, result and card. */
async function storeDraft(
	caller: Caller,
	d: Extract<PriceOutcome, { kind: 'save' }>
): Promise<PricedEstimate> {
	const db = await getDb();
	const row = await db.transaction(async (tx) => {
		const [made] = await tx
			.insert(estimates)
			.values({
				companyId: caller.companyId,
				siteId: d.siteId,
				roofPlanId: d.roofPlanId,
				status: 'draft',
				rateCardId: d.rateCard.id,
				rateCardVersion: d.rateCard.version,
				input: d.input,
				result: d.result,
				totalCents: d.result.price.totalCents,
				createdBy: caller.id
			})
			.returning({ id: estimates.id, status: estimates.status });
		await recordAudit(
			tx,
			caller.companyId,
			{ userId: caller.id },
			{
				kind: 'estimate',
				action: 'priced',
				subjectId: made.id,
				summary: `Priced a draft estimate at ${formatCents(d.result.price.totalCents)} with rates version ${d.rateCard.version}`,
				detail: { totalCents: d.result.price.totalCents, rateCardVersion: d.rateCard.version }
			}
		);
		return made;
	});
	return { ...d.result, rateCard: d.rateCard, estimate: row };
}

const cardRefs = new WeakMap<StoredRateCard, CardRef>();

function cardRef(card: StoredRateCard): CardRef {
	let ref = cardRefs.get(card);
	if (!ref) {
		ref = { id: card.id, version: card.version, json: JSON.stringify(card.card) };
		cardRefs.set(card, ref);
	}
	return ref;
}

async function latestOrNull(companyId: string): Promise<StoredRateCard | null> {
	try {
		return await latestRateCard(companyId);
	} catch (e) {
		if (e instanceof NoRateCardError) return null;
		throw e;
	}
}

/**
 * POST /api/estimates from the body as sent: parsing, validation and pricing run on a pricing
 * thread (see pricing/pool.ts), the card lookup and the store here. Answers the priced
 * estimate as UTF-8 JSON, or the saved draft; refusals throw Invalid and write nothing. The
 * demo seed prices its samples through here too.
 */
export async function priceEstimateBody(
	caller: Caller,
	body: Uint8Array
): Promise<{ saved: false; json: Uint8Array } | { saved: true; priced: PricedEstimate }> {
	const latest = await latestOrNull(caller.companyId);
	const task: PriceTask = { body, card: latest && cardRef(latest) };
	let outcome = await runPricing(task);
	// At most one look-up of each kind: a plan (the body names one) and a card (not the latest).
	for (let round = 0; round < 2; round++) {
		if (outcome.kind === 'needs-plan') {
			task.plan = await planFor(caller.companyId, outcome.roofPlanId, outcome.siteId);
		} else if (outcome.kind === 'needs-card') {
			task.card = cardRef(await cardFor(caller.companyId, outcome.rateCardId ?? undefined));
		} else break;
		outcome = await runPricing(task);
	}
	switch (outcome.kind) {
		case 'refused':
			throw new Invalid(outcome.refusal.message, outcome.refusal.issues ?? []);
		case 'needs-card':
		case 'needs-plan':
			throw new Error(`the pricing thread asked again (${outcome.kind})`);
		case 'priced':
			return { saved: false, json: outcome.json };
		case 'save':
			await assertSite(caller.companyId, outcome.siteId);
			return { saved: true, priced: await storeDraft(caller, outcome) };
	}
}

const escapeLike = (s: string) => s.replace(/[\\%_]/g, (c) => '\\' + c);

export async function listEstimates(
	companyId: string,
	f: EstimateFilters
): Promise<{ items: EstimateListItem[]; total: number; page: number; pageSize: number }> {
	const db = await getDb();
	const where: SQL[] = [eq(estimates.companyId, companyId)];
	if (f.status) where.push(eq(estimates.status, f.status));
	if (f.siteId) where.push(eq(estimates.siteId, f.siteId));
	const text = f.text?.trim();
	if (text) {
		const like = `%${escapeLike(text)}%`;
		where.push(or(ilike(sites.address, like), ilike(customers.name, like))!);
	}
	const filter = and(...where);
	const [[{ n }], items] = await Promise.all([
		db
			.select({ n: count() })
			.from(estimates)
			.leftJoin(sites, eq(sites.id, estimates.siteId))
			.leftJoin(customers, eq(customers.id, sites.customerId))
			.where(filter),
		db
			.select({
				id: estimates.id,
				status: estimates.status,
				siteId: estimates.siteId,
				address: sites.address,
				customerName: customers.name,
				totalCents: estimates.totalCents,
				squares: sql<number>`(${estimates.result}->'totals'->>'squares')::float8`,
				rateCardVersion: estimates.rateCardVersion,
				createdAt: estimates.createdAt,
				updatedAt: estimates.updatedAt
			})
			.from(estimates)
			.leftJoin(sites, eq(sites.id, estimates.siteId))
			.leftJoin(customers, eq(customers.id, sites.customerId))
			.where(filter)
			.orderBy(desc(estimates.createdAt), desc(estimates.id))
			.limit(f.pageSize)
			.offset((f.page - 1) * f.pageSize)
	]);
	return { items, total: n, page: f.page, pageSize: f.pageSize };
}

export async function getEstimate(
	companyId: string,
	id: string
): Promise<EstimateDetail | undefined> {
	const db = await getDb();
	const [row] = await db
		.select({
			e: estimates,
			address: sites.address,
			customerName: customers.name,
			createdBy: users.name
		})
		.from(estimates)
		.leftJoin(sites, eq(sites.id, estimates.siteId))
		.leftJoin(customers, eq(customers.id, sites.customerId))
		.leftJoin(users, eq(users.id, estimates.createdBy))
		.where(and(eq(estimates.id, id), eq(estimates.companyId, companyId)))
		.limit(1);
	if (!row) return undefined;
	const { e } = row;
	return {
		id: e.id,
		status: e.status,
		siteId: e.siteId,
		roofPlanId: e.roofPlanId,
		site:
			row.address !== null ? { address: row.address, customerName: row.customerName ?? '' } : null,
		rateCard: { id: e.rateCardId, version: e.rateCardVersion },
		input: e.input as EstimateInput,
		result: e.result as EstimateResult,
		totalCents: e.totalCents,
		createdBy: row.createdBy,
		createdAt: e.createdAt,
		updatedAt: e.updatedAt
	};
}

/**
 * Moves an estimate to `to`. 404 when it is not the company's, 409 when the move is not on the
 * path from its current status, 403 when the caller's role may not make it. The update is
 * conditional on the status it read, so two people acting at once can't both win.
 */
export async function changeStatus(
	caller: Caller,
	id: string,
	to: EstimateStatus
): Promise<EstimateDetail> {
	const current = await getEstimate(caller.companyId, id);
	if (!current) throw new NotFound(`No estimate with id ${id}.`);
	const from = current.status;
	if (from === to) return current;
	const roles = rolesForMove(from, to);
	if (!roles) {
		const options = legalNext(from);
		throw new Conflict(
			`An estimate that is ${from} can't become ${to}` +
				(options.length ? `; from ${from} it can become ${options.join(', ')}.` : '.'),
			[{ path: 'status', message: `${from} → ${to} is not allowed` }]
		);
	}
	if (!roles.includes(caller.role)) {
		throw new Forbidden(
			`Moving an estimate from ${from} to ${to} needs the ${roles.join(' or ')} role; you are ${caller.role}.`
		);
	}
	const viaJob = JOB_MOVES[to];
	if (viaJob) throw new Conflict(viaJob, [{ path: 'status', message: viaJob }]);
	const db = await getDb();
	await db.transaction(async (tx) => {
		const moved = await tx
			.update(estimates)
			.set({ status: to })
			.where(
				and(
					eq(estimates.id, id),
					eq(estimates.companyId, caller.companyId),
					eq(estimates.status, from)
				)
			)
			.returning({ id: estimates.id });
		if (moved.length === 0) {
			throw new Conflict('Someone changed this estimate at the same time; reload and try again.');
		}
		await auditStatus(tx, caller.companyId, { userId: caller.id }, id, from, to);
	});
	return (await getEstimate(caller.companyId, id))!;
}
