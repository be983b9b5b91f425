import { and, eq, inArray, isNull, max } from 'drizzle-orm';
import type { EstimateInput, FacetInput, EstimateResult } from '../../estimating/types';
import type { PlanFacet } from '../../schemas/roof-plan';
import type { TestSpotInput, VisitFacetInput, VisitSiteInput } from '../../schemas/site-visit';
import type { EstimateDetail } from '../../types/estimate';
import { OBSTACLES, type Obstacle, type VisitDto, type VisitFacet } from '../../types/site-visit';
import { getDb } from '../db';
import { estimates, roofPlans, sites, siteVisits, users } from '../db/schema';
import { Conflict, Invalid, NotFound } from './errors';
import { getEstimate, priceEstimateBody, type Caller } from './estimates';
import { getPlanById, toCollection } from './roof-plans';
import { recordAudit } from './audit';
import { formatCents } from '../../estimating/money';

/**
 * Site visits: the salesperson's check of an estimate's roof and site. A visit works on its own
 * copy of the facets; confirming it saves that copy as the site's next roof-plan version
 * (source "site_visit") and re-prices the estimate as measured on site, in one transaction.
 */

/** Estimates a visit may change: once sent, the customer has a price that must not move. */
const OPEN_STATUSES = ['draft', 'ready'] as const;

type VisitRow = typeof siteVisits.$inferSelect;

async function estimateOr404(companyId: string, estimateId: string): Promise<EstimateDetail> {
	const e = await getEstimate(companyId, estimateId);
	if (!e) throw new NotFound(`No estimate with id ${estimateId}.`);
	return e;
}

async function visitRow(companyId: string, estimateId: string): Promise<VisitRow | undefined> {
	const db = await getDb();
	const [row] = await db
		.select()
		.from(siteVisits)
		.where(and(eq(siteVisits.companyId, companyId), eq(siteVisits.estimateId, estimateId)));
	return row;
}

/** The visit as the screen shows it, or null before it is started. */
export async function getVisit(companyId: string, estimateId: string): Promise<VisitDto | null> {
	const row = await visitRow(companyId, estimateId);
	if (!row) return null;
	const db = await getDb();
	const planIds = [row.basePlanId, row.confirmedPlanId].filter((x): x is string => !!x);
	const [plans, who] = await Promise.all([
		planIds.length
			? db
					.select({ id: roofPlans.id, version: roofPlans.version })
					.from(roofPlans)
					.where(and(eq(roofPlans.companyId, companyId), inArray(roofPlans.id, planIds)))
			: Promise.resolve([]),
		row.confirmedBy
			? db.select({ name: users.name }).from(users).where(eq(users.id, row.confirmedBy))
			: Promise.resolve([])
	]);
	const versionOf = (id: string | null) => plans.find((p) => p.id === id)?.version ?? null;
	return {
		id: row.id,
		estimateId: row.estimateId,
		siteId: row.siteId,
		basePlanVersion: versionOf(row.basePlanId),
		facets: row.facets,
		obstacles: row.obstacles.filter((o): o is Obstacle =>
			(OBSTACLES as readonly string[]).includes(o)
		),
		waterSource: row.waterSource,
		pets: row.pets,
		gateNotes: row.gateNotes,
		notes: row.notes,
		testSpot:
			row.testStrengthPct !== null && row.testSeconds !== null && row.testRinsedClean !== null
				? {
						strengthPct: row.testStrengthPct,
						secondsToColourChange: row.testSeconds,
						rinsedClean: row.testRinsedClean,
						facetIds: row.testFacetIds
					}
				: null,
		confirmedAt: row.confirmedAt?.toISOString() ?? null,
		confirmedBy: who[0]?.name ?? null,
		confirmedPlanVersion: versionOf(row.confirmedPlanId),
		revision: row.revision
	};
}

const fromInputFacet = (f: FacetInput): PlanFacet => ({
	id: f.id,
	label: f.label ?? '',
	geometry: f.geometry,
	pitch: f.pitch,
	material: f.material,
	growth: f.growth,
	access: f.access,
	stories: f.stories,
	edges: f.edges ?? new Array(f.geometry.coordinates[0].length - 1).fill(null)
});

const toInputFacet = ({ label, ...f }: PlanFacet): FacetInput => ({
	...f,
	...(label ? { label } : {})
});

const toVisitFacet = (f: PlanFacet): VisitFacet => ({
	...f,
	checked: false,
	remote: {
		pitch: f.pitch,
		material: f.material,
		growth: f.growth,
		access: f.access,
		stories: f.stories
	}
});

/** The facets a visit starts from: the estimate's roof-plan version, else its own facets. */
async function baseFacets(companyId: string, e: EstimateDetail) {
	if (e.roofPlanId) {
		const plan = await getPlanById(companyId, e.roofPlanId);
		if (plan && plan.facets.length > 0) return { planId: plan.id, facets: plan.facets };
	}
	return { planId: null, facets: e.input.facets.map(fromInputFacet) };
}

function assertOpen(e: EstimateDetail) {
	if (!(OPEN_STATUSES as readonly string[]).includes(e.status)) {
		throw new Conflict(
			`This estimate is ${e.status}; a site visit can change only a draft or ready estimate.`
		);
	}
}

/**
 * Starts the visit of an estimate, or answers the one already started (a second tap, a second
 * tablet). What the office already knows of the site fills the visit's first values.
 */
export async function startVisit(caller: Caller, estimateId: string): Promise<VisitDto> {
	const e = await estimateOr404(caller.companyId, estimateId);
	const existing = await getVisit(caller.companyId, estimateId);
	if (existing) return existing;
	assertOpen(e);
	if (!e.siteId) throw new Conflict('This estimate has no site; a site visit needs one.');
	const db = await getDb();
	const [site] = await db
		.select()
		.from(sites)
		.where(and(eq(sites.id, e.siteId), eq(sites.companyId, caller.companyId)));
	if (!site) throw new NotFound(`No site for estimate ${estimateId}.`);
	const base = await baseFacets(caller.companyId, e);
	const flags = { ...site.flags, ...(e.input.siteFlags ?? {}) };
	const obstacles: Obstacle[] = [];
	if (flags.noGutters) obstacles.push('no_gutters');
	if (flags.plantsToProtect) obstacles.push('shrubs_beds');
	if (site.flags.powerLine) obstacles.push('power_line');
	if (site.flags.pool) obstacles.push('pond_pool');
	await db
		.insert(siteVisits)
		.values({
			companyId: caller.companyId,
			estimateId,
			siteId: e.siteId,
			basePlanId: base.planId,
			facets: base.facets.map(toVisitFacet),
			obstacles,
			waterSource: site.waterSource ?? '',
			pets: site.pets ?? '',
			gateNotes: site.gateCode ?? '',
			startedBy: caller.id
		})
		// Two tablets starting at once: the unique estimate keeps one visit, both see it.
		.onConflictDoNothing({ target: siteVisits.estimateId });
	return (await getVisit(caller.companyId, estimateId))!;
}

/** The visit to change: started, not yet confirmed, and its estimate still open. */
async function openVisit(caller: Caller, estimateId: string): Promise<VisitRow> {
	const e = await estimateOr404(caller.companyId, estimateId);
	const row = await visitRow(caller.companyId, estimateId);
	if (!row) throw new Conflict('Start the site visit first.');
	if (row.confirmedAt) {
		throw new Conflict('This site visit is confirmed; its findings are part of the estimate now.');
	}
	assertOpen(e);
	return row;
}

/**
 * Writes a change to an open visit, conditional on it still being unconfirmed, so a change
 * racing a confirmation never lands after it.
 */
async function updateOpen(row: VisitRow, set: Partial<typeof siteVisits.$inferInsert>) {
	const db = await getDb();
	const done = await db
		.update(siteVisits)
		.set({ ...set, revision: row.revision + 1 })
		.where(
			and(
				eq(siteVisits.id, row.id),
				eq(siteVisits.revision, row.revision),
				isNull(siteVisits.confirmedAt)
			)
		)
		.returning({ id: siteVisits.id });
	if (done.length === 0) {
		throw new Conflict('Someone changed this site visit at the same time; reload and try again.');
	}
}

export async function saveVisitFacet(
	caller: Caller,
	estimateId: string,
	input: VisitFacetInput
): Promise<VisitFacet> {
	const row = await openVisit(caller, estimateId);
	const at = row.facets.findIndex((f) => f.id === input.facetId);
	if (at < 0) {
		throw Invalid.of([{ path: 'facetId', message: 'That facet is not on this roof plan.' }]);
	}
	const { facetId: _id, ...fields } = input;
	const facet: VisitFacet = { ...row.facets[at], ...fields, checked: true };
	const facets = row.facets.map((f, i) => (i === at ? facet : f));
	await updateOpen(row, { facets });
	return facet;
}

export async function saveVisitSite(
	caller: Caller,
	estimateId: string,
	input: VisitSiteInput
): Promise<void> {
	const row = await openVisit(caller, estimateId);
	await updateOpen(row, input);
}

export async function saveTestSpot(
	caller: Caller,
	estimateId: string,
	input: TestSpotInput
): Promise<void> {
	const row = await openVisit(caller, estimateId);
	const known = new Set(row.facets.map((f) => f.id));
	const unknown = input.facetIds.findIndex((id) => !known.has(id));
	if (unknown >= 0) {
		throw Invalid.of([{ path: 'facetIds', message: 'Choose facets from this roof plan only.' }]);
	}
	// Every facet ticked says the same as none: the spot stands for the whole roof.
	const facetIds = input.facetIds.length === known.size ? [] : input.facetIds;
	await updateOpen(row, {
		testStrengthPct: input.strengthPct,
		testSeconds: input.secondsToColourChange,
		testRinsedClean: input.rinsedClean,
		testFacetIds: facetIds
	});
}

/** The estimate's frozen input with the visit's findings: what confirming prices. */
export function visitEstimateInput(original: EstimateInput, visit: VisitDto): EstimateInput {
	const { testSpot: _t, siteFlags, ...rest } = original;
	const obstacles = new Set(visit.obstacles);
	const input: EstimateInput = {
		...rest,
		facets: visit.facets.map(({ checked: _c, remote: _r, ...f }) => toInputFacet(f)),
		measuredOnSite: true,
		siteFlags: {
			...siteFlags,
			noGutters: obstacles.has('no_gutters'),
			plantsToProtect: obstacles.has('shrubs_beds')
		}
	};
	if (visit.testSpot) {
		const { facetIds, ...spot } = visit.testSpot;
		input.testSpot = facetIds.length ? { ...spot, facetIds } : spot;
	}
	return input;
}

export type ConfirmOutcome = {
	/** False when the visit was confirmed before (a repeated tap): nothing changed. */
	confirmed: boolean;
	planVersion: number | null;
	before: { totalCents: number; lowCents: number; highCents: number };
	after: { totalCents: number; lowCents: number; highCents: number };
};

const priceOf = (r: EstimateResult) => ({
	totalCents: r.price.totalCents,
	lowCents: r.price.lowCents,
	highCents: r.price.highCents
});

/**
 * Confirms the visit: prices the visit's facets, site flags and test spot with the estimate's
 * own rate-card version (so only what was found on site moves the price) as measured on site,
 * then, in one transaction, saves the site-visit copy of the roof plan, replaces the estimate's
 * frozen input and result, moves it to ready and marks the visit confirmed. A refusal by the
 * model writes nothing.
 */
export async function confirmVisit(caller: Caller, estimateId: string): Promise<ConfirmOutcome> {
	const e = await estimateOr404(caller.companyId, estimateId);
	const visit = await getVisit(caller.companyId, estimateId);
	if (!visit) throw new Conflict('Start the site visit first.');
	if (visit.confirmedAt) {
		const p = priceOf(e.result);
		return { confirmed: false, planVersion: visit.confirmedPlanVersion, before: p, after: p };
	}
	assertOpen(e);
	const input = visitEstimateInput(e.input, visit);
	const body = new TextEncoder().encode(JSON.stringify({ ...input, rateCardId: e.rateCard.id }));
	const priced = await priceEstimateBody(caller, body);
	if (priced.saved) throw new Error('a confirmation must not save a new estimate');
	const result = JSON.parse(new TextDecoder().decode(priced.json)) as EstimateResult & {
		rateCard?: unknown;
	};
	delete result.rateCard;

	const db = await getDb();
	const planFacets: PlanFacet[] = visit.facets.map(({ checked: _c, remote: _r, ...f }) => f);
	const version = await db
		.transaction(async (tx) => {
			const [v] = await tx
				.select({ confirmedAt: siteVisits.confirmedAt, revision: siteVisits.revision })
				.from(siteVisits)
				.where(eq(siteVisits.id, visit.id))
				.for('update');
			if (!v || v.confirmedAt || v.revision !== visit.revision) {
				throw new Conflict(
					'Someone changed this site visit at the same time; reload and try again.'
				);
			}
			const [{ latest }] = await tx
				.select({ latest: max(roofPlans.version) })
				.from(roofPlans)
				.where(eq(roofPlans.siteId, visit.siteId));
			const next = (latest ?? 0) + 1;
			const [plan] = await tx
				.insert(roofPlans)
				.values({
					companyId: caller.companyId,
					siteId: visit.siteId,
					version: next,
					source: 'site_visit',
					facets: toCollection(planFacets, visit.basePlanVersion),
					note: 'Site visit',
					createdBy: caller.id
				})
				.returning({ id: roofPlans.id });
			const moved = await tx
				.update(estimates)
				.set({
					roofPlanId: plan.id,
					input,
					result,
					totalCents: result.price.totalCents,
					status: 'ready'
				})
				.where(
					and(
						eq(estimates.id, estimateId),
						eq(estimates.companyId, caller.companyId),
						inArray(estimates.status, [...OPEN_STATUSES])
					)
				)
				.returning({ id: estimates.id });
			if (moved.length === 0) {
				throw new Conflict(
					'The estimate changed at the same time (it was sent?); reload and look.'
				);
			}
			await recordAudit(
				tx,
				caller.companyId,
				{ userId: caller.id },
				{
					kind: 'estimate',
					action: 'repriced',
					subjectId: estimateId,
					summary:
						`Confirmed the site visit: price ${formatCents(e.result.price.totalCents)} → ` +
						`${formatCents(result.price.totalCents)}, ${e.status} → ready`,
					detail: {
						from: { status: e.status, totalCents: e.result.price.totalCents },
						to: { status: 'ready', totalCents: result.price.totalCents },
						roofPlanVersion: next
					}
				}
			);
			await tx
				.update(siteVisits)
				.set({
					confirmedPlanId: plan.id,
					confirmedAt: new Date(),
					confirmedBy: caller.id,
					revision: visit.revision + 1
				})
				.where(eq(siteVisits.id, visit.id));
			return next;
		})
		.catch((err: unknown) => {
			// Someone saved a plan version of this site at the same moment: nothing was written.
			if (isUniqueViolation(err)) {
				throw new Conflict('The roof plan was saved by someone else just now; try again.');
			}
			throw err;
		});
	return {
		confirmed: true,
		planVersion: version,
		before: priceOf(e.result),
		after: priceOf(result)
	};
}

const isUniqueViolation = (e: unknown) =>
	!!e &&
	typeof e === 'object' &&
	((e as { code?: string }).code === '23505' ||
		(e as { cause?: { code?: string } }).cause?.code === '23505');
