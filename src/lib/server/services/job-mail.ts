import { eq } from 'drizzle-orm';
import { getDb } from '../db';
import { companies, customers, estimates, jobs, sites } from '../db/schema';
import { env } from '../env';
import { buildJobEmail } from '../mail/job-email';
import { enqueueMail, sendQueuedMail } from '../mail/outbox';
import { createMailTransport } from '../mail/transport';

export type MailOutcome = 'queued' | 'sent' | 'no-address' | 'already-sent';

/**
 * E-mails the customer the job's current plan through the outbox. The key is the job and its
 * revision, so each change to the plan is one message however often this runs for it.
 * Answers what happened, for the scheduler's confirmation.
 */
export async function mailJobChange(
	companyId: string,
	jobId: string,
	kind: 'scheduled' | 'moved' | 'postponed'
): Promise<MailOutcome> {
	const db = await getDb();
	const [r] = await db
		.select({ j: jobs, site: sites, customer: customers, company: companies })
		.from(jobs)
		.innerJoin(estimates, eq(estimates.id, jobs.estimateId))
		.innerJoin(sites, eq(sites.id, estimates.siteId))
		.innerJoin(customers, eq(customers.id, sites.customerId))
		.innerJoin(companies, eq(companies.id, jobs.companyId))
		.where(eq(jobs.id, jobId));
	if (!r || r.j.companyId !== companyId) return 'no-address';
	if (!r.customer.email) return 'no-address';
	const last = r.j.history[r.j.history.length - 1];
	const built = buildJobEmail({
		kind,
		companyName: r.company.name,
		customerName: r.customer.name,
		siteAddress: r.site.address,
		date: r.j.date,
		windowStart: r.j.windowStart,
		windowEnd: r.j.windowEnd,
		reason: last?.reason ?? null,
		notes: { gate: !!r.site.gateCode, pets: !!r.site.pets, water: !!r.site.waterSource }
	});
	const queued = await enqueueMail(db, {
		companyId,
		idempotencyKey: `job:${jobId}:r${r.j.revision}`,
		from: env.mailFrom,
		to: r.customer.email,
		...built,
		subjectKind: 'job',
		subjectId: jobId
	});
	if (!queued.created) return 'already-sent';
	// One try now; the outbox's retry loop takes over if it fails.
	const status = await sendQueuedMail(db, createMailTransport(), queued.id).catch(() => null);
	return status === 'sent' ? 'sent' : 'queued';
}
