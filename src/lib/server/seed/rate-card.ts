import { DEFAULT_RATE_CARD } from '../../estimating/rate-card';
import { getDb } from '../db';
import { rateCards } from '../db/schema';

export const DEFAULT_CARD_NOTE = 'Demo defaults from memory — tune them';

/** Version 1 of the company's rate card is the demo default; run again, it adds nothing. */
export async function seedRateCard(companyId: string): Promise<number> {
	const db = await getDb();
	const rows = await db
		.insert(rateCards)
		.values({
			companyId,
			version: 1,
			card: DEFAULT_RATE_CARD,
			isDefault: true,
			note: DEFAULT_CARD_NOTE
		})
		.onConflictDoNothing({ target: [rateCards.companyId, rateCards.version] })
		.returning({ id: rateCards.id });
	return rows.length;
}
