/**
 * Fills CLEARPITCH_DATA_DIR (already migrated and seeded with the demo) with 10,000 more sites of
 * the demo company, each with its customer, and 20,000 estimates spread over 100 of them, inserted
 * in bulk through Drizzle. Invented Wrenfield streets and names; every estimate reuses a demo
 * estimate's frozen input and result, so rows are the real size.
 * With `--demo-only` it adds only the demo's sample plans and estimates (the small data set).
 *   CLEARPITCH_DATA_DIR=… npx tsx bench/seed-big.ts [--demo-only]
 */
import { eq } from 'drizzle-orm';
import { closeDb, getDb } from '../src/lib/server/db';
import { companies, customers, estimates, sites } from '../src/lib/server/db/schema';
import { seedDemo } from '../src/lib/server/seed/demo';

const BIG_SITES = 10_000;
const BIG_ESTIMATES = 20_000;
const BIG_ESTIMATED_SITES = 100;
const BATCH = 1000;

const STREETS = [
	'Alder',
	'Birchwood',
	'Cobble',
	'Dunmore',
	'Elm Hollow',
	'Fernbank',
	'Gable',
	'Heron',
	'Ivy',
	'Juniper',
	'Kestrel',
	'Larkspur',
	'Millrace',
	'Northgate',
	'Orchard',
	'Quarry',
	'Rookery',
	'Saltmarsh',
	'Tanner',
	'Willowbrook'
];
const KINDS = ['Lane', 'Road', 'Way', 'Close', 'Court'];
const GIVEN = [
	'Ada',
	'Bram',
	'Cleo',
	'Dov',
	'Edda',
	'Fenn',
	'Greer',
	'Hal',
	'Isla',
	'Jory',
	'Kit',
	'Lune',
	'Mabry',
	'Nell',
	'Orrin',
	'Pim',
	'Quill',
	'Rue',
	'Sorrel',
	'Tam'
];
const FAMILY = [
	'Ashdown',
	'Brackett',
	'Corrow',
	'Delane',
	'Eastry',
	'Farrow',
	'Galloway',
	'Hollins',
	'Imbert',
	'Jessop',
	'Kettle',
	'Lowrie',
	'Marchbank',
	'Nettleton',
	'Oakes',
	'Pellow',
	'Quarrie',
	'Rendle',
	'Stobart',
	'Trevail'
];

await seedDemo({ samples: true });
if (process.argv.includes('--demo-only')) {
	await closeDb();
	process.exit(0);
}
const db = await getDb();
const [company] = await db
	.select({ id: companies.id })
	.from(companies)
	.where(eq(companies.name, 'Harbor & Pine Exterior Care'));
if (!company) throw new Error('Seed the demo first (scripts/seed-test.ts).');
const [template] = await db
	.select()
	.from(estimates)
	.where(eq(estimates.companyId, company.id))
	.limit(1);
if (!template) throw new Error('The demo has no estimate to copy.');
// Around the demo's own sites, so the map of a page shows the sample neighbourhood.
const [near] = await db.select({ lat: sites.lat, lon: sites.lon }).from(sites).limit(1);

const started = Date.now();
const siteIds: string[] = [];
for (let from = 0; from < BIG_SITES; from += BATCH) {
	const n = Math.min(BATCH, BIG_SITES - from);
	const idx = Array.from({ length: n }, (_, k) => from + k);
	// Each batch in one transaction: the bulk load is seconds, not minutes.
	await db.transaction(async (tx) => {
		const cs = await tx
			.insert(customers)
			.values(
				idx.map((i) => ({
					companyId: company.id,
					name: `${GIVEN[i % 20]} ${FAMILY[Math.floor(i / 20) % 20]} ${Math.floor(i / 400) + 1}`
				}))
			)
			.returning({ id: customers.id });
		const ss = await tx
			.insert(sites)
			.values(
				idx.map((i, k) => ({
					companyId: company.id,
					customerId: cs[k].id,
					address: `${(i % 500) + 1} ${STREETS[Math.floor(i / 500) % 20]} ${KINDS[i % 5]}, Wrenfield`,
					lat: near.lat + ((i % 100) - 50) * 0.00005,
					lon: near.lon + (Math.floor(i / 100) - 50) * 0.00005
				}))
			)
			.returning({ id: sites.id });
		siteIds.push(...ss.map((s) => s.id));
	});
}

const estimated = siteIds.slice(0, BIG_ESTIMATED_SITES);
const t0 = Date.parse('2026-01-05T08:00:00Z');
for (let from = 0; from < BIG_ESTIMATES; from += BATCH) {
	const n = Math.min(BATCH, BIG_ESTIMATES - from);
	await db.insert(estimates).values(
		Array.from({ length: n }, (_, k) => {
			const i = from + k;
			const at = new Date(t0 + i * 7 * 60_000);
			return {
				companyId: company.id,
				siteId: estimated[i % BIG_ESTIMATED_SITES],
				status: (['draft', 'ready', 'sent', 'accepted'] as const)[i % 4],
				rateCardId: template.rateCardId,
				rateCardVersion: template.rateCardVersion,
				input: template.input,
				result: template.result,
				totalCents: template.totalCents + (i % 37) * 100,
				createdBy: template.createdBy,
				createdAt: at,
				updatedAt: at
			};
		})
	);
}
await closeDb();
console.log(
	`seeded ${BIG_SITES} sites and ${BIG_ESTIMATES} estimates over ${BIG_ESTIMATED_SITES} sites in ${((Date.now() - started) / 1000).toFixed(1)} s`
);
