import { isClosed } from '../../types/job';
import { and, desc, eq } from 'drizzle-orm';
import type { EstimateResult } from '../../estimating/types';
import type {
	EstimateFact,
	JobFact,
	ProposalFact,
	ReportFacts,
	SuggestionFact
} from '../../reports/types';
import { getDb } from '../db';
import {
	estimates,
	jobHours,
	jobLogs,
	jobs,
	proposalAnswers,
	proposals,
	roofPlans,
	sites
} from '../db/schema';
import { Conflict, NotFound } from './errors';
import { fromCollection } from './roof-plans';

function estimateFact(row: {
	id: string;
	status: EstimateFact['status'];
	createdAt: Date;
	result: unknown;
}): EstimateFact {
	const r = row.result as EstimateResult;
	return {
		id: row.id,
		status: row.status,
		createdAt: row.createdAt.toISOString(),
		totalCents: r.price.totalCents,
		preTaxCents: r.price.preTaxCents,
		chemicalCents: r.cost.chemicalCents,
		labourCents: r.cost.labourCents,
		overheadCents: r.cost.overheadCents,
		facets: r.facets.map((f) => ({
			material: f.material,
			growth: f.growth,
			squares: f.squares,
			priceCents: f.priceCents,
			mixGal: f.mixGal,
			labourHours: f.labourHours
		}))
	};
}

/** Everything the reports read for one company, as plain facts for `src/lib/reports`. */
export async function reportFacts(companyId: string): Promise<ReportFacts> {
	const db = await getDb();
	const [est, props, jobRows] = await Promise.all([
		db
			.select({
				id: estimates.id,
				status: estimates.status,
				createdAt: estimates.createdAt,
				result: estimates.result
			})
			.from(estimates)
			.where(eq(estimates.companyId, companyId)),
		db
			.select({
				estimateId: proposals.estimateId,
				sentAt: proposals.createdAt,
				decision: proposalAnswers.decision
			})
			.from(proposals)
			.leftJoin(proposalAnswers, eq(proposalAnswers.proposalId, proposals.id))
			.where(eq(proposals.companyId, companyId)),
		db
			.select({
				id: jobs.id,
				estimateId: jobs.estimateId,
				status: jobs.status,
				date: jobs.date,
				doneAt: jobs.doneAt,
				expectedHours: jobs.expectedHours,
				address: sites.address,
				result: estimates.result,
				stockGalUsed: jobLogs.stockGalUsed,
				surfactantOzUsed: jobLogs.surfactantOzUsed,
				hoursLogged: jobHours.hours
			})
			.from(jobs)
			.innerJoin(estimates, eq(estimates.id, jobs.estimateId))
			.leftJoin(sites, eq(sites.id, estimates.siteId))
			.leftJoin(jobLogs, eq(jobLogs.jobId, jobs.id))
			.leftJoin(jobHours, eq(jobHours.jobId, jobs.id))
			.where(eq(jobs.companyId, companyId))
	]);
	const proposalFacts: ProposalFact[] = props.map((p) => ({
		estimateId: p.estimateId,
		sentAt: p.sentAt.toISOString(),
		decision: p.decision
	}));
	const jobFacts: JobFact[] = jobRows.map((j) => {
		const chem = (j.result as EstimateResult).chemistry;
		return {
			id: j.id,
			estimateId: j.estimateId,
			label: j.address ?? 'Job without a site',
			// A paid job is a done job whose invoice is settled.
			done: isClosed(j.status),
			date: j.date,
			doneAt: j.doneAt ? j.doneAt.toISOString() : null,
			hoursExpected: j.expectedHours,
			hoursLogged: j.hoursLogged,
			stockGalExpected: chem.totalStockGal,
			stockGalUsed: j.stockGalUsed,
			surfactantOzExpected: chem.totalSurfactantOz,
			surfactantOzUsed: j.surfactantOzUsed
		};
	});
	return {
		estimates: est.map(estimateFact),
		proposals: proposalFacts,
		jobs: jobFacts,
		suggestions: await suggestionFacts(companyId)
	};
}

/**
 * Suggested and chosen growth grades, each facet once: from every site's latest remote roof
 * plan, the estimator's last word on it. Not from estimates, which repeat a plan's facets once
 * per estimate priced from it; and not from site-visit copies, whose grade is what was found on
 * the roof (the calibration's truth), not the estimator's choice.
 */
async function suggestionFacts(companyId: string): Promise<SuggestionFact[]> {
	const db = await getDb();
	const plans = await db
		.selectDistinctOn([roofPlans.siteId], { facets: roofPlans.facets })
		.from(roofPlans)
		.where(and(eq(roofPlans.companyId, companyId), eq(roofPlans.source, 'remote')))
		.orderBy(roofPlans.siteId, desc(roofPlans.version));
	return plans.flatMap((p) =>
		fromCollection(p.facets).flatMap((f) =>
			f.growthSuggestion ? [{ suggested: f.growthSuggestion.grade, chosen: f.growth }] : []
		)
	);
}

/**
 * Records (or corrects) the crew hours a done job took, from the crew's time sheet. Only a done
 * job of the company: the hours of work not yet finished would mislead the report.
 */
export async function recordJobHours(
	companyId: string,
	userId: string,
	jobId: string,
	hours: number
): Promise<void> {
	const db = await getDb();
	await db.transaction(async (tx) => {
		const [job] = await tx
			.select({ status: jobs.status })
			.from(jobs)
			.where(and(eq(jobs.id, jobId), eq(jobs.companyId, companyId)));
		if (!job) throw new NotFound(`No job with id ${jobId}.`);
		if (!isClosed(job.status)) {
			throw new Conflict(`Hours are recorded once the job is done; this one is ${job.status}.`, [
				{ path: 'hours', message: `The job is ${job.status}, not done yet.` }
			]);
		}
		await tx
			.insert(jobHours)
			.values({ companyId, jobId, hours, recordedBy: userId })
			.onConflictDoUpdate({
				target: jobHours.jobId,
				set: { hours, recordedBy: userId, updatedAt: new Date() }
			});
	});
}
