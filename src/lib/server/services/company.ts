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
