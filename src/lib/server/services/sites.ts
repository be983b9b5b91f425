import { and, asc, eq, ilike, or } from 'drizzle-orm';
import type { SiteInput } from '$lib/schemas/site';
import { getDb } from '../db';
import { customers, sites } from '../db/schema';

export type SiteSummary = {
	id: string;
	address: string;
	lat: number;
	lon: number;
	customerName: string;
	sceneHouseId: string | null;
};

export async function listSites(companyId: string, q?: string): Promise<SiteSummary[]> {
	const db = await getDb();
	const text = q?.trim();
	return db
		.select({
			id: sites.id,
			address: sites.address,
			lat: sites.lat,
			lon: sites.lon,
			customerName: customers.name,
			sceneHouseId: sites.sceneHouseId
		})
		.from(sites)
		.innerJoin(customers, eq(customers.id, sites.customerId))
		.where(
			and(
				eq(sites.companyId, companyId),
				text
					? or(ilike(sites.address, `%${text}%`), ilike(customers.name, `%${text}%`))
					: undefined
			)
		)
		.orderBy(asc(sites.address));
}

export async function getSite(companyId: string, siteId: string) {
	const db = await getDb();
	const [row] = await db
		.select({ site: sites, customer: customers })
		.from(sites)
		.innerJoin(customers, eq(customers.id, sites.customerId))
		.where(and(eq(sites.id, siteId), eq(sites.companyId, companyId)));
	return row;
}

export async function createSite(companyId: string, input: SiteInput) {
	const db = await getDb();
	return db.transaction(async (tx) => {
		const [customer] = await tx
			.insert(customers)
			.values({
				companyId,
				name: input.customerName,
				email: input.customerEmail,
				phone: input.customerPhone
			})
			.returning({ id: customers.id });
		const [site] = await tx
			.insert(sites)
			.values({
				companyId,
				customerId: customer.id,
				address: input.address,
				lat: input.lat,
				lon: input.lon,
				notes: input.notes ?? '',
				gateCode: input.gateCode,
				pets: input.pets,
				waterSource: input.waterSource
			})
			.returning({ id: sites.id });
		return site.id;
	});
}
