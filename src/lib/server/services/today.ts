import { count, eq, sql } from 'drizzle-orm';
import { getDb } from '../db';
import { estimates, roofPlans, sites, users } from '../db/schema';
import { listEstimates } from './estimates';

export async function todaySummary(companyId: string) {
	const db = await getDb();
	const [[s], [u], [measured], byStatus, recent] = await Promise.all([
		db.select({ n: count() }).from(sites).where(eq(sites.companyId, companyId)),
		db.select({ n: count() }).from(users).where(eq(users.companyId, companyId)),
		db
			.select({ n: sql<number>`count(distinct ${roofPlans.siteId})::int` })
			.from(roofPlans)
			.where(eq(roofPlans.companyId, companyId)),
		db
			.select({ status: estimates.status, n: count() })
			.from(estimates)
			.where(eq(estimates.companyId, companyId))
			.groupBy(estimates.status),
		listEstimates(companyId, { page: 1, pageSize: 5 })
	]);
	return {
		sites: s.n,
		unmeasured: s.n - measured.n,
		estimates: recent.total,
		team: u.n,
		byStatus: Object.fromEntries(byStatus.map((r) => [r.status, r.n])) as Record<string, number>,
		recent: recent.items.map((e) => ({
			id: e.id,
			status: e.status,
			address: e.address,
			customerName: e.customerName,
			totalCents: e.totalCents
		}))
	};
}
