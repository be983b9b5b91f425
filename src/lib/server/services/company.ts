import { eq } from 'drizzle-orm';
import { getDb } from '../db';
import { companies } from '../db/schema';
import { recordAudit } from './audit';

export async function getCompany(companyId: string) {
	const db = await getDb();
	const [c] = await db.select().from(companies).where(eq(companies.id, companyId));
	return c;
}

type Fields = Record<string, string | null>;

/** Updates some of the company's settings and logs what changed from what, in one transaction. */
async function updateSettings(
	companyId: string,
	actorId: string,
	action: string,
	what: string,
	set: Fields
) {
	const db = await getDb();
	await db.transaction(async (tx) => {
		const [before] = await tx
			.select()
			.from(companies)
			.where(eq(companies.id, companyId))
			.for('update');
		if (!before) return;
		const old = before as unknown as Fields;
		const changed = Object.keys(set).filter((k) => (old[k] ?? null) !== (set[k] ?? null));
		await tx.update(companies).set(set).where(eq(companies.id, companyId));
		if (changed.length === 0) return;
		await recordAudit(
			tx,
			companyId,
			{ userId: actorId },
			{
				kind: 'company',
				action,
				subjectId: companyId,
				summary: `Changed the ${what}: ${changed.join(', ')}`,
				detail: {
					from: Object.fromEntries(changed.map((k) => [k, old[k] ?? null])),
					to: Object.fromEntries(changed.map((k) => [k, set[k] ?? null]))
				}
			}
		);
	});
}

export async function setImagery(
	companyId: string,
	template: string | null,
	attribution: string | null,
	actorId: string
) {
	await updateSettings(companyId, actorId, 'imagery', 'imagery source', {
		imageryUrlTemplate: template,
		imageryAttribution: attribution
	});
}

/** The details proposals print; a proposal already sent keeps the ones it was sent with. */
export async function setContact(
	companyId: string,
	c: {
		phone: string | null;
		email: string | null;
		postalAddress: string | null;
		licence: string | null;
	},
	actorId: string
) {
	await updateSettings(companyId, actorId, 'contact', 'company details', c);
}
