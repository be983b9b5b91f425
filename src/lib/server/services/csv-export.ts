import { asc, eq, inArray } from 'drizzle-orm';
import { toCsv, type Cell } from '../../csv/cells';
import { CUSTOMER_COLUMNS, SITE_COLUMNS } from '../../schemas/csv-import';
import type { EstimateResult } from '../../estimating/types';
import { getDb } from '../db';
import { customers, estimates, jobHours, jobLogs, jobs, sites, users } from '../db/schema';

export const EXPORT_KINDS = ['customers', 'sites', 'estimates', 'jobs'] as const;
export type ExportKind = (typeof EXPORT_KINDS)[number];

const flagCell = (v: boolean | undefined) => (v === undefined ? '' : v ? 'yes' : 'no');
const dollars = (cents: number) => (cents / 100).toFixed(2);
const iso = (d: Date | null) => (d ? d.toISOString() : '');

async function customersCsv(companyId: string): Promise<string> {
	const db = await getDb();
	const rows = await db
		.select()
		.from(customers)
		.where(eq(customers.companyId, companyId))
		.orderBy(asc(customers.createdAt), asc(customers.id));
	return toCsv(
		CUSTOMER_COLUMNS,
		rows.map((c) => [c.id, c.name, c.email, c.phone, c.notes])
	);
}

async function sitesCsv(companyId: string): Promise<string> {
	const db = await getDb();
	const rows = await db
		.select()
		.from(sites)
		.where(eq(sites.companyId, companyId))
		.orderBy(asc(sites.createdAt), asc(sites.id));
	return toCsv(
		SITE_COLUMNS,
		rows.map((s) => [
			s.id,
			s.customerId,
			s.address,
			s.lat,
			s.lon,
			s.notes,
			s.gateCode,
			s.pets,
			s.waterSource,
			flagCell(s.flags.noGutters),
			flagCell(s.flags.plantsToProtect),
			flagCell(s.flags.pool),
			flagCell(s.flags.powerLine)
		])
	);
}

const ESTIMATE_COLUMNS = [
	'estimate_ref',
	'site_ref',
	'address',
	'customer',
	'status',
	'created_at',
	'rate_card_version',
	'facets',
	'squares',
	'price_before_tax',
	'tax',
	'total',
	'deposit',
	'cost',
	'margin_pct'
];

async function estimatesCsv(companyId: string): Promise<string> {
	const db = await getDb();
	const rows = await db
		.select({ e: estimates, address: sites.address, customer: customers.name })
		.from(estimates)
		.leftJoin(sites, eq(sites.id, estimates.siteId))
		.leftJoin(customers, eq(customers.id, sites.customerId))
		.where(eq(estimates.companyId, companyId))
		.orderBy(asc(estimates.createdAt), asc(estimates.id));
	return toCsv(
		ESTIMATE_COLUMNS,
		rows.map(({ e, address, customer }) => {
			const r = e.result as EstimateResult;
			return [
				e.id,
				e.siteId,
				address,
				customer,
				e.status,
				iso(e.createdAt),
				e.rateCardVersion,
				r.facets.length,
				r.totals.squares,
				dollars(r.price.preTaxCents),
				dollars(r.price.taxCents),
				dollars(r.price.totalCents),
				dollars(r.price.depositCents),
				dollars(r.cost.totalCents),
				Math.round(r.marginPct * 10) / 10
			] satisfies Cell[];
		})
	);
}

const JOB_COLUMNS = [
	'job_ref',
	'estimate_ref',
	'address',
	'customer',
	'status',
	'date',
	'window_start',
	'window_end',
	'crew',
	'hours_expected',
	'hours_logged',
	'stock_gal_expected',
	'stock_gal_used',
	'surfactant_oz_expected',
	'surfactant_oz_used',
	'done_at'
];

async function jobsCsv(companyId: string): Promise<string> {
	const db = await getDb();
	const rows = await db
		.select({
			j: jobs,
			result: estimates.result,
			address: sites.address,
			customer: customers.name,
			stockUsed: jobLogs.stockGalUsed,
			surfactantUsed: jobLogs.surfactantOzUsed,
			hoursLogged: jobHours.hours
		})
		.from(jobs)
		.innerJoin(estimates, eq(estimates.id, jobs.estimateId))
		.leftJoin(sites, eq(sites.id, estimates.siteId))
		.leftJoin(customers, eq(customers.id, sites.customerId))
		.leftJoin(jobLogs, eq(jobLogs.jobId, jobs.id))
		.leftJoin(jobHours, eq(jobHours.jobId, jobs.id))
		.where(eq(jobs.companyId, companyId))
		.orderBy(asc(jobs.date), asc(jobs.id));
	const crewIds = [...new Set(rows.flatMap((r) => r.j.crewIds))];
	const names = new Map(
		crewIds.length
			? (
					await db
						.select({ id: users.id, name: users.name })
						.from(users)
						.where(inArray(users.id, crewIds))
				).map((u) => [u.id, u.name])
			: []
	);
	return toCsv(
		JOB_COLUMNS,
		rows.map((r) => {
			const chem = (r.result as EstimateResult).chemistry;
			return [
				r.j.id,
				r.j.estimateId,
				r.address,
				r.customer,
				r.j.status,
				r.j.date,
				r.j.windowStart,
				r.j.windowEnd,
				r.j.crewIds.map((id) => names.get(id) ?? id).join('; '),
				r.j.expectedHours,
				r.hoursLogged,
				chem.totalStockGal,
				r.stockUsed,
				chem.totalSurfactantOz,
				r.surfactantUsed,
				iso(r.j.doneAt)
			] satisfies Cell[];
		})
	);
}

/** One of the company's lists as a CSV file. */
export function exportCsv(companyId: string, kind: ExportKind): Promise<string> {
	switch (kind) {
		case 'customers':
			return customersCsv(companyId);
		case 'sites':
			return sitesCsv(companyId);
		case 'estimates':
			return estimatesCsv(companyId);
		case 'jobs':
			return jobsCsv(companyId);
	}
}
