// Shared by the API, browser and benchmark runs: reads and prepares a seeded data dir while no
// server has it open (PGlite allows one process per data dir).
import type { PGlite } from '@electric-sql/pglite';
import { openPglite } from '../helpers/pglite';
import { hashApiToken, newApiToken } from '../../src/lib/server/auth/tokens';
import type { EstimateRequest } from '../../src/lib/schemas/estimate';
import { estimateFacetsOf, houses } from '../../geodata/scene';

export type SeededSite = { id: string; address: string; customer: string; houseId: string | null };

export type Prepared = {
	sites: SeededSite[];
	/** A live API token of the owner. */
	ownerToken: string;
	/** An owner token that has been revoked. */
	revokedToken: string;
};

async function withDb<T>(dir: string, run: (db: PGlite) => Promise<T>): Promise<T> {
	const db = openPglite(dir);
	try {
		await db.waitReady;
		return await run(db);
	} finally {
		await db.close();
	}
}

/** Lists the seeded sites and creates two owner API tokens, one of them revoked. */
export function prepareDataDir(dir: string): Promise<Prepared> {
	return withDb(dir, async (db) => {
		const sites = await db.query<{ id: string; address: string; customer: string }>(
			`select s.id, s.address, c.name as customer
			   from sites s join customers c on c.id = s.customer_id order by s.address`
		);
		// The seed puts each scene house's site at the house's address.
		const houseAt = new Map(houses().map((h) => [h.properties.address, h.properties.houseId]));
		const owner = await db.query<{ id: string; company_id: string }>(
			`select id, company_id from users where role = 'owner' limit 1`
		);
		const { id: userId, company_id: companyId } = owner.rows[0];
		const ownerToken = newApiToken();
		const revokedToken = newApiToken();
		await db.query(
			`insert into api_tokens (company_id, user_id, name, token_hash) values ($1, $2, 'tests', $3)`,
			[companyId, userId, hashApiToken(ownerToken)]
		);
		await db.query(
			`insert into api_tokens (company_id, user_id, name, token_hash, revoked_at)
			 values ($1, $2, 'revoked', $3, now())`,
			[companyId, userId, hashApiToken(revokedToken)]
		);
		return {
			sites: sites.rows.map((r) => ({
				id: r.id,
				address: r.address,
				customer: r.customer,
				houseId: houseAt.get(r.address) ?? null
			})),
			ownerToken,
			revokedToken
		};
	});
}

export function countRows(dir: string, table: 'estimates' | 'rate_cards'): Promise<number> {
	return withDb(dir, async (db) => {
		const r = await db.query<{ n: number }>(`select count(*)::int as n from ${table}`);
		return r.rows[0].n;
	});
}

/** A scene house's true roof plan as an API request body. */
export function sceneRequest(houseId: string): EstimateRequest {
	return {
		facets: estimateFacetsOf(houseId)
	};
}
