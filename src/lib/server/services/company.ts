import { eq } from 'drizzle-orm';
import { getDb } from '../db';
import { companies } from '../db/schema';

export async function getCompany(companyId: string) {
	const db = await getDb();
	const [c] = await db.select().from(companies).where(eq(companies.id, companyId));
	return c;
}

export async function setImagery(
	companyId: string,
	template: string | null,
	attribution: string | null
) {
	const db = await getDb();
	await db
		.update(companies)
		.set({ imageryUrlTemplate: template, imageryAttribution: attribution })
		.where(eq(companies.id, companyId));
}

/** The details proposals print; a proposal already sent keeps the ones it was sent with. */
export async function setContact(
	companyId: string,
	c: {
		phone: string | null;
		email: string | null;
		postalAddress: string | null;
		licence: string | null;
	}
) {
	const db = await getDb();
	await db.update(companies).set(c).where(eq(companies.id, companyId));
}
