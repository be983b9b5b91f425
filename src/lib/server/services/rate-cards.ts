import { and, desc, eq, max } from 'drizzle-orm';
import { upgradeRateCard, type RateCard } from '../../estimating/rate-card';
import { getDb } from '../db';
import { rateCards, users } from '../db/schema';
import diff from 'microdiff';
import { recordAudit } from './audit';

export type StoredRateCard = {
	id: string;
	version: number;
	card: RateCard;
	isDefault: boolean;
	note: string;
	createdAt: Date;
};

export type RateCardVersion = Omit<StoredRateCard, 'card'> & { createdBy: string | null };

/** Raised when a company has no rate card at all (the seed was never run). */
export class NoRateCardError extends Error {
	constructor() {
		super('This company has no rate card yet: an owner must save one on the Rates page.');
	}
}

const columns = {
	id: rateCards.id,
	version: rateCards.version,
	card: rateCards.card,
	isDefault: rateCards.isDefault,
	note: rateCards.note,
	createdAt: rateCards.createdAt
};

/**
 * The latest card per company, kept in memory so pricing a request costs no query. A save
 * bumps the company's generation before dropping the entry, so a read that started before the
 * save can't put the old card back. One process serves an installation (PGlite allows one).
 */
const latest = new Map<string, StoredRateCard>();
const generation = new Map<string, number>();

function invalidate(companyId: string) {
	generation.set(companyId, (generation.get(companyId) ?? 0) + 1);
	latest.delete(companyId);
}

export async function latestRateCard(companyId: string): Promise<StoredRateCard> {
	const hit = latest.get(companyId);
	if (hit) return hit;
	const gen = generation.get(companyId) ?? 0;
	const db = await getDb();
	const [row] = await db
		.select(columns)
		.from(rateCards)
		.where(eq(rateCards.companyId, companyId))
		.orderBy(desc(rateCards.version))
		.limit(1);
	if (!row) throw new NoRateCardError();
	const stored = { ...row, card: upgradeRateCard(row.card as RateCard) };
	if ((generation.get(companyId) ?? 0) === gen) latest.set(companyId, stored);
	return stored;
}

/** A given version of the company's card, or undefined when the id is not one of its cards. */
export async function rateCardById(
	companyId: string,
	id: string
): Promise<StoredRateCard | undefined> {
	const cached = latest.get(companyId);
	if (cached?.id === id) return cached;
	const db = await getDb();
	const [row] = await db
		.select(columns)
		.from(rateCards)
		.where(and(eq(rateCards.companyId, companyId), eq(rateCards.id, id)))
		.limit(1);
	return row ? { ...row, card: upgradeRateCard(row.card as RateCard) } : undefined;
}

/** Every version with its card, newest first (the Rates page shows what changed). */
export async function rateCardHistory(
	companyId: string
): Promise<(RateCardVersion & { card: RateCard })[]> {
	const db = await getDb();
	const rows = await db
		.select({ ...columns, createdBy: users.name })
		.from(rateCards)
		.leftJoin(users, eq(users.id, rateCards.createdBy))
		.where(eq(rateCards.companyId, companyId))
		.orderBy(desc(rateCards.version));
	return rows.map((r) => ({ ...r, card: upgradeRateCard(r.card as RateCard) }));
}

/**
 * Saves an edited card as the next version; earlier versions and the estimates priced with
 * them stay as they are. The card must already have passed rateCardSchema.
 */
export async function saveRateCard(
	companyId: string,
	userId: string,
	card: RateCard,
	note: string
): Promise<StoredRateCard> {
	const db = await getDb();
	const row = await db.transaction(async (tx) => {
		const [{ top }] = await tx
			.select({ top: max(rateCards.version) })
			.from(rateCards)
			.where(eq(rateCards.companyId, companyId));
		const [previous] = top
			? await tx
					.select({ card: rateCards.card })
					.from(rateCards)
					.where(and(eq(rateCards.companyId, companyId), eq(rateCards.version, top)))
			: [];
		// The unique (company, version) constraint refuses a concurrent save of the same number.
		const [inserted] = await tx
			.insert(rateCards)
			.values({
				companyId,
				version: (top ?? 0) + 1,
				card,
				isDefault: false,
				note,
				createdBy: userId
			})
			.returning(columns);
		const changes = previous ? diff(previous.card as RateCard, card) : [];
		await recordAudit(
			tx,
			companyId,
			{ userId },
			{
				kind: 'rate-card',
				action: 'saved',
				subjectId: inserted.id,
				summary:
					`Saved rates version ${inserted.version}` +
					(previous
						? ` (${changes.length} figure${changes.length === 1 ? '' : 's'} changed)`
						: '') +
					(note ? `: ${note}` : ''),
				detail: {
					version: inserted.version,
					note,
					// What moved from what, by the figure's place in the card (first 100).
					changes: changes.slice(0, 100).map((c) => ({
						path: c.path.join('.'),
						from: 'oldValue' in c ? c.oldValue : null,
						to: 'value' in c ? c.value : null
					}))
				}
			}
		);
		return inserted;
	});
	invalidate(companyId);
	return { ...row, card: upgradeRateCard(row.card as RateCard) };
}
