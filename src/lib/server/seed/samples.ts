import { and, count, eq } from 'drizzle-orm';
import { house, planFacetsOf } from '../../../../geodata/scene';
import type { Role } from '$lib/roles';
import { savePlanSchema } from '$lib/schemas/roof-plan';
import { getDb } from '../db';
import { roofPlans, sites, users } from '../db/schema';
import { changeStatus, priceEstimateBody, type EstimateStatus } from '../services/estimates';
import { savePlan } from '../services/roof-plans';

/**
 * Demo only: measured roof plans and estimates at various stages for some scene houses, so a
 * first look at the demo isn't empty. h01–h03 stay unmeasured for trying the editor.
 */
const SAMPLES: { houseId: string; status: EstimateStatus }[] = [
	{ houseId: 'h04', status: 'sent' },
	{ houseId: 'h05', status: 'draft' },
	{ houseId: 'h06', status: 'ready' },
	{ houseId: 'h07', status: 'accepted' },
	{ houseId: 'h09', status: 'accepted' },
	{ houseId: 'h10', status: 'paid' }
];

const PATH: EstimateStatus[] = ['draft', 'ready', 'sent', 'accepted', 'scheduled', 'done', 'paid'];

export async function seedSamples(
	companyId: string
): Promise<{ plans: number; estimates: number }> {
	const db = await getDb();
	const [owner] = await db
		.select({ id: users.id, role: users.role })
		.from(users)
		.where(and(eq(users.companyId, companyId), eq(users.role, 'owner')))
		.limit(1);
	const caller = { id: owner.id, companyId, role: 'owner' as Role };
	const made = { plans: 0, estimates: 0 };

	for (const sample of SAMPLES) {
		// A scene house's site is the one at its address; the schema knows nothing of the scene.
		const address = house(sample.houseId)?.properties.address;
		if (!address) continue;
		const [site] = await db
			.select({ id: sites.id })
			.from(sites)
			.where(and(eq(sites.companyId, companyId), eq(sites.address, address)));
		if (!site) continue;
		const [{ n: plansThere }] = await db
			.select({ n: count() })
			.from(roofPlans)
			.where(eq(roofPlans.siteId, site.id));
		if (plansThere > 0) continue;

		const facets = planFacetsOf(sample.houseId);
		const plan = savePlanSchema.parse({
			siteId: site.id,
			facets,
			source: 'remote',
			note: 'Traced from the sample imagery'
		});
		const saved = await savePlan(companyId, owner.id, plan);
		if (!saved.ok) throw new Error(`Sample roof plan for ${sample.houseId}: ${saved.reason}`);
		made.plans += 1;

		// Priced the way the API prices: from the saved plan, with the same checks, card and store.
		const body = { siteId: site.id, roofPlanId: saved.plan.id, save: true };
		const done = await priceEstimateBody(caller, new TextEncoder().encode(JSON.stringify(body)));
		if (!done.saved) throw new Error(`the sample estimate for ${sample.houseId} was not saved`);
		made.estimates += 1;
		for (const to of PATH.slice(1, PATH.indexOf(sample.status) + 1)) {
			await changeStatus(caller, done.priced.estimate!.id, to);
		}
	}
	return made;
}
