// An invented second tenant, written straight into a seeded data dir before the server opens it
// (PGlite allows one process per data dir), for the tests that check one company never reaches
// another's rows.
import { closeDb, getDb } from '../../src/lib/server/db';
import { companies, customers, roofPlans, sites } from '../../src/lib/server/db/schema';

type Db = Awaited<ReturnType<typeof getDb>>;

export type OtherCompany = { companyId: string; siteId: string };

/**
 * Adds the other company with one customer and one site, then runs `more` on the same open
 * database (for extra rows or reads) before closing it.
 */
export async function addOtherCompany<T = undefined>(
	dir: string,
	more?: (db: Db, other: OtherCompany) => Promise<T>
): Promise<OtherCompany & { more: T }> {
	process.env.CLEARPITCH_DATA_DIR = dir;
	process.env.DATABASE_URL = '';
	const db = await getDb();
	try {
		const [c] = await db.insert(companies).values({ name: 'Marrowgate Roof Care' }).returning();
		const [cu] = await db
			.insert(customers)
			.values({ companyId: c.id, name: 'Tamsin Oakhurst' })
			.returning();
		const [s] = await db
			.insert(sites)
			.values({
				companyId: c.id,
				customerId: cu.id,
				address: '4 Fenwick Row, Wrenfield',
				lat: 35.52,
				lon: -74.46
			})
			.returning();
		const other = { companyId: c.id, siteId: s.id };
		const extra = (more ? await more(db, other) : undefined) as T;
		return { ...other, more: extra };
	} finally {
		await closeDb();
	}
}

/** An empty roof plan (version 1) of the other company's site; returns its id. */
export async function addEmptyPlan(db: Db, other: OtherCompany): Promise<string> {
	const [p] = await db
		.insert(roofPlans)
		.values({
			companyId: other.companyId,
			siteId: other.siteId,
			version: 1,
			facets: { type: 'FeatureCollection', features: [] }
		})
		.returning();
	return p.id;
}
