import { count, eq } from 'drizzle-orm';
import { getDb } from '../db';
import { estimates, sites, users } from '../db/schema';

export async function todaySummary(companyId: string) {
	const db = await getDb();
	const [[s], [e], [u]] = await Promise.all([
		db.select({ n: count() }).from(sites).where(eq(sites.companyId, companyId)),
		db.select({ n: count() }).from(estimates).where(eq(estimates.companyId, companyId)),
		db.select({ n: count() }).from(users).where(eq(users.companyId, companyId))
	]);
	return { sites: s.n, estimates: e.n, team: u.n };
}
