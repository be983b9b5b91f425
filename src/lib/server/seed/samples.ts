import { and, asc, count, eq } from 'drizzle-orm';
import { house, planFacetsOf } from '../../../../geodata/scene';
import type { Role } from '$lib/roles';
import { savePlanSchema } from '$lib/schemas/roof-plan';
import { getDb } from '../db';
import { estimates, roofPlans, sites, users } from '../db/schema';
import type { EstimateResult } from '../../estimating/types';
import { recordPayment } from '../services/balance';
import { changeStatus, priceEstimateBody, type EstimateStatus } from '../services/estimates';
import { markDone, saveLog, scheduleJob, type Caller } from '../services/jobs';
import { savePlan } from '../services/roof-plans';
import { recordJobHours } from '../services/reports';
import { suggestGrade, type GrowthMeasures } from '../../estimating/growth-suggest';
import { checklistItems } from '../../jobs/checklist';
import { addDays, localToday } from '../../jobs/week';
import { hashPassword } from '../auth/password';
import { DEMO_PASSWORD } from './demo';

/**
 * Demo only: measured roof plans and estimates at various stages for some scene houses, so a
 * first look at the demo isn't empty. h01–h03 stay unmeasured for trying the editor.
 */
const SAMPLES: { houseId: string; status: EstimateStatus }[] = [
	{ houseId: 'h04', status: 'sent' },
	{ houseId: 'h05', status: 'draft' },
	{ houseId: 'h06', status: 'done' },
	{ houseId: 'h07', status: 'accepted' },
	{ houseId: 'h09', status: 'scheduled' },
	{ houseId: 'h10', status: 'paid' }
];

/** A second technician, so the week view has more than one crew row. */
const SECOND_CREW = {
	email: 'crew2@harborpine.example',
	name: 'Ines Calloway',
	role: 'crew' as const
};

/** The scheduled sample's site notes, shown on its crew sheet. */
const SITE_NOTES = {
	gateCode: 'Side gate code 4417',
	pets: 'Two cats kept indoors; tortoise pen by the back fence',
	waterSource: 'Tap on the north wall by the garage'
};

/** When each sample job is (was) done, counted from the seed's day. */
const JOB_DAYS: Partial<Record<EstimateStatus, number>> = { scheduled: 0, done: -1, paid: -3 };

const PATH: EstimateStatus[] = ['draft', 'ready', 'sent', 'accepted', 'scheduled', 'done', 'paid'];

export async function seedSamples(
	companyId: string
): Promise<{ users: number; plans: number; estimates: number }> {
	const db = await getDb();
	const [owner] = await db
		.select({ id: users.id, role: users.role, name: users.name })
		.from(users)
		.where(and(eq(users.companyId, companyId), eq(users.role, 'owner')))
		.limit(1);
	const caller: Caller = { id: owner.id, companyId, role: 'owner' as Role, name: owner.name };
	const made = { users: 0, plans: 0, estimates: 0 };
	const added = await db
		.insert(users)
		.values({ ...SECOND_CREW, companyId, passwordHash: await hashPassword(DEMO_PASSWORD) })
		.onConflictDoNothing({ target: users.email })
		.returning({ id: users.id });
	made.users += added.length;

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

		const facets = (await sampleSuggestions()).add(planFacetsOf(sample.houseId));
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
		const id = done.priced.estimate!.id;
		const upTo = Math.min(PATH.indexOf(sample.status), PATH.indexOf('accepted'));
		for (const to of PATH.slice(1, upTo + 1)) await changeStatus(caller, id, to);
		if (PATH.indexOf(sample.status) > PATH.indexOf('accepted')) {
			if (sample.status === 'scheduled') {
				await db.update(sites).set(SITE_NOTES).where(eq(sites.id, site.id));
			}
			await sampleJob(caller, id, sample.status);
		}
	}
	return made;
}

/** Schedules a sample through the jobs service, and for done and paid logs and closes it. */
async function sampleJob(caller: Caller, estimateId: string, status: EstimateStatus) {
	const db = await getDb();
	const crew = await db
		.select({ id: users.id })
		.from(users)
		.where(and(eq(users.companyId, caller.companyId), eq(users.role, 'crew')))
		.orderBy(asc(users.email));
	const date = addDays(localToday(), JOB_DAYS[status] ?? 0);
	const { jobId } = await scheduleJob(caller, {
		estimateId,
		date,
		windowStart: status === 'scheduled' ? '08:00' : '09:00',
		windowEnd: status === 'scheduled' ? '10:00' : '11:00',
		crewIds: status === 'scheduled' ? [crew[0].id] : crew.map((c) => c.id)
	});
	if (status === 'scheduled') return;
	const [est] = await db
		.select({ result: estimates.result })
		.from(estimates)
		.where(eq(estimates.id, estimateId));
	const result = est.result as EstimateResult;
	const items = checklistItems(
		result.facets.map((f, i) => ({ id: f.id, n: i + 1, label: f.label }))
	);
	await saveLog(caller, jobId, {
		checklist: Object.fromEntries(items.map((i) => [i.key, true])),
		stockGalUsed: Math.round(result.chemistry.totalStockGal * 1.05 * 10) / 10,
		surfactantOzUsed: Math.round(result.chemistry.totalSurfactantOz),
		measuredStockPct: 11.8,
		notes: 'North slope needed a second pass on the lichen by the chimney.',
		clientUpdatedAt: new Date().toISOString()
	});
	// The sample closes with a reason in place of after photos (the seed has no camera).
	await markDone(
		caller,
		jobId,
		'Sample job: after photos were kept on the crew phone.',
		process.env.ORIGIN || 'http://localhost:3000'
	);
	// The time sheet's hours, a little over the model's, so the hours report has a comparison.
	await recordJobHours(
		caller.companyId,
		caller.id,
		jobId,
		Math.round(result.labour.hours * 11) / 10
	);
	if (status === 'paid')
		await recordPayment(caller, estimateId, { method: 'cheque', reference: 'Cheque 1042' });
}

/**
 * The growth grade the editor would suggest for each sample facet, read from the generated sample
 * tiles, so the demo's plans carry a suggestion beside the grade chosen. Without the tiles
 * (node geodata/generate-tiles.js not run) the plans simply carry none.
 */
async function sampleSuggestions() {
	let byFacet = new Map<string, GrowthMeasures>();
	try {
		const { measureSceneFacets } = await import('../../../../geodata/tile-reader');
		byFacet = new Map((await measureSceneFacets()).map((f) => [f.facetId, f.measures]));
	} catch {
		// No tiles: no suggestions.
	}
	return {
		add: <F extends { id: string }>(facets: F[]) =>
			facets.map((f) => {
				const m = byFacet.get(f.id);
				return m ? { ...f, growthSuggestion: { ...suggestGrade(m), measures: m } } : f;
			})
	};
}
