import fs from 'node:fs';
import path from 'node:path';
import { and, eq } from 'drizzle-orm';
import type { Role } from '$lib/roles';
import { getDb } from '../db';
import { companies, customers, sites, users } from '../db/schema';
import { hashPassword } from '../auth/password';
import { seedRateCard } from './rate-card';

/** Invented demo scenario: no real people, firms or places. */
export const DEMO_COMPANY = 'Harbor & Pine Exterior Care';
export const DEMO_PASSWORD = 'pitch-demo-2026';

/** Printed on the demo's proposals; 555-01xx numbers are reserved for fiction. */
const DEMO_CONTACT = {
	phone: '(555) 010-0142',
	email: 'office@harborpine.example',
	postalAddress: '18 Ropewalk Lane, Wrenfield',
	licence: 'Insured · applicator licence WF-0417 (invented for the demo)'
};

export const DEMO_USERS: { email: string; name: string; role: Role }[] = [
	{ email: 'owner@harborpine.example', name: 'Maren Holloway', role: 'owner' },
	{ email: 'estimator@harborpine.example', name: 'Theo Lindqvist', role: 'estimator' },
	{ email: 'sales@harborpine.example', name: 'Priya Castellan', role: 'sales' },
	{ email: 'crew@harborpine.example', name: 'Jonah Reyes-Whitfield', role: 'crew' }
];

type SceneHouse = {
	houseId: string;
	address: string;
	customer: string;
	lat: number;
	lon: number;
	notes?: string;
	noGutters?: boolean;
};

/** Two more sites in town, off the sample imagery, so the list isn't only the scene. */
const EXTRA_SITES: SceneHouse[] = [
	{
		houseId: '',
		address: '7 Quarry Bend, Wrenfield',
		customer: 'Osric Penhallow',
		lat: 35.5291,
		lon: -74.4512,
		notes: 'Called about black streaks on the north slope.'
	},
	{
		houseId: '',
		address: '233 Saltmarsh Road, Wrenfield',
		customer: 'Wrenfield Harbour Townhomes (property manager: Della Fairbrook)',
		lat: 35.5128,
		lon: -74.4705,
		notes: 'Six units, shared roof; HOA approval needed before work.'
	}
];

/** An invented address under the reserved .example domain, from the customer's first two words. */
function demoEmail(name: string): string {
	const words = name.toLowerCase().match(/[a-z]+/g) ?? ['customer'];
	return `${words.slice(0, 2).join('.')}@wrenfield.example`;
}

function sceneHouses(): SceneHouse[] {
	const file = path.resolve('geodata/scene.geojson');
	if (!fs.existsSync(file)) return [];
	const scene = JSON.parse(fs.readFileSync(file, 'utf8')) as {
		features: { properties: Record<string, unknown> }[];
	};
	return scene.features
		.filter((f) => f.properties.kind === 'house')
		.map((f) => f.properties as unknown as SceneHouse);
}

/** `samples` adds measured plans and estimates for the demo; tests start without them. */
export async function seedDemo(opts: { samples?: boolean } = {}) {
	const db = await getDb();
	const created = { users: 0, sites: 0, rateCards: 0, roofPlans: 0, estimates: 0 };

	let [company] = await db.select().from(companies).where(eq(companies.name, DEMO_COMPANY));
	if (!company) {
		[company] = await db
			.insert(companies)
			.values({ name: DEMO_COMPANY, ...DEMO_CONTACT })
			.returning();
	} else if (company.phone === null) {
		await db.update(companies).set(DEMO_CONTACT).where(eq(companies.id, company.id));
	}

	const passwordHash = await hashPassword(DEMO_PASSWORD);
	for (const u of DEMO_USERS) {
		const rows = await db
			.insert(users)
			.values({ ...u, companyId: company.id, passwordHash })
			.onConflictDoNothing({ target: users.email })
			.returning({ id: users.id });
		created.users += rows.length;
	}

	for (const h of [...sceneHouses(), ...EXTRA_SITES]) {
		const [exists] = await db
			.select({ id: sites.id })
			.from(sites)
			.where(and(eq(sites.companyId, company.id), eq(sites.address, h.address)));
		if (exists) continue;
		await db.transaction(async (tx) => {
			const [c] = await tx
				.insert(customers)
				.values({ companyId: company.id, name: h.customer, email: demoEmail(h.customer) })
				.returning({ id: customers.id });
			await tx.insert(sites).values({
				companyId: company.id,
				customerId: c.id,
				address: h.address,
				lat: h.lat,
				lon: h.lon,
				notes: h.notes ?? '',
				flags: h.noGutters ? { noGutters: true } : {}
			});
		});
		created.sites += 1;
	}

	created.rateCards += await seedRateCard(company.id);
	if (opts.samples) {
		const { seedSamples } = await import('./samples');
		const made = await seedSamples(company.id);
		created.users += made.users;
		created.roofPlans += made.plans;
		created.estimates += made.estimates;
	}
	return { companyId: company.id, created };
}
