import { and, asc, desc, eq, inArray } from 'drizzle-orm';
import type { EstimateResult } from '../../estimating/types';
import { upgradeRateCard, type RateCard } from '../../estimating/rate-card';
import { formatCents } from '../../estimating/money';
import { priceWithExtras } from '../../proposal/price';
import { isPastValidity, type ProposalStatus } from '../../proposal/status';
import type {
	DepositState,
	ProposalSnapshot,
	ProposalVersion,
	PublicAnswer,
	TickedExtra
} from '../../proposal/types';
import type { Role } from '../../roles';
import { getDb, type Db } from '../db';
import {
	companies,
	customers,
	estimates,
	mailOutbox,
	photos,
	proposalAnswers,
	proposals,
	rateCards,
	siteVisits,
	sites
} from '../db/schema';
import { env } from '../env';
import {
	buildProposalEmail,
	enqueueMail,
	getMailTransport,
	sendQueuedMail,
	type OutboxRow
} from '../mail';
import type { DbTx } from '../mail/outbox';
import {
	createCheckout,
	depositCheckoutsFor,
	getPaymentsClient,
	type CheckoutRow
} from '../payments';
import { buildSnapshot, estimateDigest } from '../proposals/snapshot';
import { hashProposalToken, newProposalToken, PROPOSAL_TOKEN } from '../proposals/token';
import { Conflict, Forbidden, Gone, Invalid, NotFound } from './errors';
import { readPhotoFile } from './visit-photos';
import type { StoredFile } from '../storage';
import { auditStatus } from './audit';

export type ProposalCaller = { id: string; companyId: string; role: Role; name?: string };

/** Sales sends and withdraws proposals; the owner may do anything (as for the estimate's moves). */
const SENDERS: readonly Role[] = ['owner', 'sales'];

type ProposalRow = typeof proposals.$inferSelect;
type AnswerRow = typeof proposalAnswers.$inferSelect;

function publicAnswer(a: AnswerRow): PublicAnswer {
	return {
		decision: a.decision,
		fullName: a.fullName,
		extras: a.extras,
		declineReason: a.declineReason,
		answeredAt: a.answeredAt,
		ipAddress: a.ipAddress,
		proposalVersion: a.proposalVersion,
		totalCents: a.totalCents,
		depositCents: a.depositCents
	};
}

const depositKeyPrefix = (proposalId: string) => `deposit:${proposalId}:`;

/** A proposal's deposit, from the checkouts started for it (newest first). */
function depositOf(proposalId: string, checkouts: CheckoutRow[]): DepositState {
	const mine = checkouts.filter((c) => c.idempotencyKey.startsWith(depositKeyPrefix(proposalId)));
	const paid = mine.find((c) => c.paidAt !== null);
	if (paid) return { state: 'paid', amountCents: paid.amountPaidCents ?? 0, paidAt: paid.paidAt! };
	const open = mine.find((c) => c.status === 'open');
	if (open) return { state: 'open', amountCents: open.amountCents };
	if (mine.length) return { state: 'cancelled', amountCents: mine[0].amountCents };
	return { state: 'none' };
}

type EstimateSource = {
	estimate: typeof estimates.$inferSelect;
	photos: { id: string; fileName: string }[];
	address: string;
	customerName: string;
	customerEmail: string | null;
	noGutters: boolean;
	company: typeof companies.$inferSelect;
	card: RateCard;
};

async function loadSource(
	db: Db | DbTx,
	companyId: string,
	estimateId: string,
	lock = false
): Promise<EstimateSource> {
	const q = db
		.select({
			estimate: estimates,
			address: sites.address,
			flags: sites.flags,
			customerName: customers.name,
			customerEmail: customers.email,
			company: companies,
			card: rateCards.card
		})
		.from(estimates)
		.innerJoin(companies, eq(companies.id, estimates.companyId))
		.innerJoin(rateCards, eq(rateCards.id, estimates.rateCardId))
		.leftJoin(sites, eq(sites.id, estimates.siteId))
		.leftJoin(customers, eq(customers.id, sites.customerId))
		.where(and(eq(estimates.id, estimateId), eq(estimates.companyId, companyId)))
		.limit(1);
	// Two sends at once queue on the estimate's row, so only one makes the next version.
	const [row] = lock ? await q.for('update', { of: estimates }) : await q;
	if (!row) throw new NotFound(`No estimate with id ${estimateId}.`);
	if (row.address === null) {
		throw new Conflict('This estimate has no site, so it has no customer to send a proposal to.');
	}
	// The site-visit photos the salesperson marked for the customer (copies carry no EXIF).
	const marked = await db
		.select({ id: photos.id, fileName: photos.fileName })
		.from(photos)
		.innerJoin(siteVisits, eq(siteVisits.id, photos.visitId))
		.where(
			and(
				eq(siteVisits.estimateId, estimateId),
				eq(photos.companyId, companyId),
				eq(photos.forProposal, true)
			)
		)
		.orderBy(asc(photos.createdAt));
	return {
		estimate: row.estimate,
		photos: marked,
		address: row.address,
		customerName: row.customerName ?? '',
		customerEmail: row.customerEmail,
		noGutters: !!row.flags?.noGutters,
		company: row.company,
		card: upgradeRateCard(row.card as RateCard)
	};
}

function snapshotOf(
	s: EstimateSource,
	o: { version: number; validUntil: string; salesperson: string | null; now: Date }
): ProposalSnapshot {
	const input = s.estimate.input as { siteFlags?: { noGutters?: boolean } };
	return buildSnapshot({
		result: s.estimate.result as EstimateResult,
		company: {
			name: s.company.name,
			phone: s.company.phone,
			email: s.company.email,
			address: s.company.postalAddress,
			licence: s.company.licence
		},
		customerName: s.customerName,
		siteAddress: s.address,
		siteFlags: { noGutters: s.noGutters || !!input.siteFlags?.noGutters },
		salesperson: o.salesperson,
		depositPct: s.card.depositPct,
		taxPct: s.card.taxPct,
		validUntil: o.validUntil,
		issuedOn: o.now.toISOString().slice(0, 10),
		version: o.version,
		photos: s.photos
	});
}

/**
 * The office's view of an estimate's proposals: every version, newest first, with the
 * customer's answer, the e-mail's delivery state and the deposit; and the proposal as it would
 * be sent now (`preview`), or as the latest version froze it.
 */
export async function proposalsOf(
	companyId: string,
	estimateId: string,
	opts: { validUntil: string; salesperson: string | null; now?: Date }
): Promise<{
	estimate: { id: string; status: string; digest: string };
	customerEmail: string | null;
	preview: ProposalSnapshot;
	versions: ProposalVersion[];
	/** The latest version was made from the estimate as it is now. */
	latestIsCurrent: boolean;
}> {
	const db = await getDb();
	const now = opts.now ?? new Date();
	const src = await loadSource(db, companyId, estimateId);
	const rows = await db
		.select()
		.from(proposals)
		.where(and(eq(proposals.companyId, companyId), eq(proposals.estimateId, estimateId)))
		.orderBy(desc(proposals.version));
	const ids = rows.map((r) => r.id);
	const [answers, mail, checkouts] = await Promise.all([
		ids.length
			? db.select().from(proposalAnswers).where(inArray(proposalAnswers.proposalId, ids))
			: Promise.resolve([] as AnswerRow[]),
		ids.length
			? db
					.select()
					.from(mailOutbox)
					.where(
						and(
							eq(mailOutbox.companyId, companyId),
							eq(mailOutbox.subjectKind, 'proposal'),
							inArray(mailOutbox.subjectId, ids)
						)
					)
					.orderBy(desc(mailOutbox.createdAt))
			: Promise.resolve([] as OutboxRow[]),
		depositCheckoutsFor(db, companyId, estimateId)
	]);
	const digest = estimateDigest(src.estimate.input, src.estimate.result);
	const versions = rows.map((p) => {
		const a = answers.find((x) => x.proposalId === p.id);
		return {
			id: p.id,
			version: p.version,
			status: p.status,
			expired: p.status === 'open' && isPastValidity(p.validUntil, now),
			validUntil: p.validUntil,
			recipientEmail: p.recipientEmail,
			totalCents: p.totalCents,
			depositCents: p.depositCents,
			sentAt: p.createdAt,
			revokedAt: p.revokedAt,
			answer: a ? publicAnswer(a) : null,
			mail: mail
				.filter((m) => m.subjectId === p.id)
				.map(({ id, status, attempts, lastError, nextAttemptAt, sentAt }) => ({
					id,
					status,
					attempts,
					lastError,
					nextAttemptAt,
					sentAt
				})),
			deposit: depositOf(p.id, checkouts)
		};
	});
	const latest = rows[0];
	const latestIsCurrent = !!latest && latest.estimateDigest === digest;
	return {
		estimate: { id: src.estimate.id, status: src.estimate.status, digest },
		customerEmail: src.customerEmail,
		preview:
			latest && latestIsCurrent
				? latest.snapshot
				: snapshotOf(src, { ...opts, now, version: (latest?.version ?? 0) + 1 }),
		versions,
		latestIsCurrent
	};
}

export type SendResult = {
	proposalId: string;
	version: number;
	/** False when the same proposal had already been sent: nothing new was made or mailed. */
	created: boolean;
	mailStatus: string | null;
};

/**
 * Sends a ready estimate's proposal: freezes a new version with a fresh private link, writes the
 * e-mail to the outbox in the same transaction, moves the estimate to `sent`, then tries the
 * e-mail at once (a failure is retried by the outbox loop and shows on the estimate). Sending an
 * unchanged estimate again returns the open version and sends nothing; an estimate changed
 * since its last version gets a new version, and the old link stops accepting answers.
 */
export async function sendProposal(
	caller: ProposalCaller,
	estimateId: string,
	input: { to: string; validUntil: string },
	linkBase: string,
	now = new Date()
): Promise<SendResult> {
	if (!SENDERS.includes(caller.role)) {
		throw new Forbidden(
			`Sending a proposal needs the owner or sales role; you are ${caller.role}.`
		);
	}
	const db = await getDb();
	const made = await db.transaction(async (tx) => {
		const src = await loadSource(tx, caller.companyId, estimateId, true);
		const e = src.estimate;
		if (e.status !== 'ready' && e.status !== 'sent') {
			throw new Conflict(
				`Only a ready estimate can be sent; this one is ${e.status}.` +
					(e.status === 'draft' ? ' Mark it ready first.' : ''),
				[{ path: 'status', message: `${e.status} can't be sent` }]
			);
		}
		const digest = estimateDigest(e.input, e.result);
		const [latest] = await tx
			.select()
			.from(proposals)
			.where(eq(proposals.estimateId, e.id))
			.orderBy(desc(proposals.version))
			.limit(1);
		if (latest && latest.estimateDigest === digest) {
			if (latest.status === 'open') {
				return { proposalId: latest.id, version: latest.version, created: false, mailId: null };
			}
			if (latest.status === 'accepted' || latest.status === 'declined') {
				throw new Conflict(
					`The customer already ${latest.status} version ${latest.version} of this proposal.`
				);
			}
		}
		if (latest?.status === 'open') {
			await tx.update(proposals).set({ status: 'superseded' }).where(eq(proposals.id, latest.id));
		}
		const version = (latest?.version ?? 0) + 1;
		const token = newProposalToken();
		const snapshot = snapshotOf(src, {
			version,
			validUntil: input.validUntil,
			salesperson: caller.name ?? null,
			now
		});
		const [p] = await tx
			.insert(proposals)
			.values({
				companyId: caller.companyId,
				estimateId: e.id,
				version,
				status: 'open',
				tokenHash: hashProposalToken(token),
				estimateDigest: digest,
				snapshot,
				totalCents: snapshot.totalCents,
				depositCents: snapshot.depositCents,
				depositPct: snapshot.depositPct,
				taxPct: snapshot.taxPct,
				validUntil: input.validUntil,
				recipientEmail: input.to,
				sentBy: caller.id
			})
			.returning({ id: proposals.id });
		const mail = buildProposalEmail({
			companyName: src.company.name,
			companyPhone: src.company.phone,
			companyEmail: src.company.email,
			customerName: src.customerName,
			siteAddress: src.address,
			proposalVersion: version,
			totalCents: snapshot.totalCents,
			depositCents: snapshot.depositCents,
			validUntil: input.validUntil,
			link: new URL(`/p/${token}`, linkBase).toString(),
			salespersonName: caller.name ?? null
		});
		const queued = await enqueueMail(tx, {
			companyId: caller.companyId,
			idempotencyKey: `proposal:${e.id}:v${version}`,
			from: env.mailFrom,
			to: input.to,
			subject: mail.subject,
			text: mail.text,
			html: mail.html,
			subjectKind: 'proposal',
			subjectId: p.id
		});
		if (e.status === 'ready') {
			await tx.update(estimates).set({ status: 'sent' }).where(eq(estimates.id, e.id));
			await auditStatus(
				tx,
				caller.companyId,
				{ userId: caller.id },
				e.id,
				'ready',
				'sent',
				`proposal version ${version}`
			);
		}
		return { proposalId: p.id, version, created: true, mailId: queued.id };
	});
	const mailStatus = made.mailId ? await sendQueuedMail(db, getMailTransport(), made.mailId) : null;
	return {
		proposalId: made.proposalId,
		version: made.version,
		created: made.created,
		mailStatus
	};
}

/** Withdraws an open proposal's link: the customer's page then says so instead of showing it. */
export async function revokeProposal(
	caller: ProposalCaller,
	estimateId: string,
	proposalId: string
): Promise<void> {
	if (!SENDERS.includes(caller.role)) {
		throw new Forbidden(
			`Withdrawing a proposal needs the owner or sales role; you are ${caller.role}.`
		);
	}
	const db = await getDb();
	const where = and(
		eq(proposals.id, proposalId),
		eq(proposals.estimateId, estimateId),
		eq(proposals.companyId, caller.companyId)
	);
	const done = await db
		.update(proposals)
		.set({ status: 'revoked', revokedAt: new Date() })
		.where(and(where, eq(proposals.status, 'open')))
		.returning({ id: proposals.id });
	if (done.length) return;
	const [p] = await db.select({ status: proposals.status }).from(proposals).where(where);
	if (!p) throw new NotFound('No such proposal on this estimate.');
	throw new Conflict(`Only an open proposal can be withdrawn; this one is ${p.status}.`);
}

// ——— The customer's side: reached by the private link only ———

export type CustomerProposal = {
	id: string;
	version: number;
	status: ProposalStatus;
	snapshot: ProposalSnapshot;
	answer: PublicAnswer | null;
	deposit: DepositState;
};

function contactLine(s: ProposalSnapshot): string {
	const how = [s.company.phone, s.company.email].filter(Boolean).join(' or ');
	return how ? `${s.company.name} (${how})` : s.company.name;
}

/** Refuses a link that leads nowhere: unknown or withdrawn → NotFound, replaced or expired → Gone. */
function assertOpenable(p: ProposalRow | undefined, now: Date): asserts p is ProposalRow {
	if (!p) {
		throw new NotFound('This proposal link is not valid. Check that the whole link was copied.');
	}
	if (p.status === 'revoked') {
		throw new NotFound(
			`This proposal link was withdrawn. Please contact ${contactLine(p.snapshot)} for a current proposal.`
		);
	}
	if (p.status === 'superseded') {
		throw new Gone(
			`This proposal was replaced by a newer version; please use the link in the latest e-mail from ${p.snapshot.company.name}.`
		);
	}
	if (p.status === 'open' && isPastValidity(p.validUntil, now)) {
		throw new Gone(
			`This proposal was good until ${p.validUntil} and has expired. Please contact ${contactLine(p.snapshot)} for a fresh one.`
		);
	}
}

async function byToken(db: Db | DbTx, token: string, lock = false) {
	if (!PROPOSAL_TOKEN.test(token)) return undefined;
	const q = db
		.select()
		.from(proposals)
		.where(eq(proposals.tokenHash, hashProposalToken(token)))
		.limit(1);
	const [row] = lock ? await q.for('update') : await q;
	return row;
}

/**
 * A photo the proposal shows, for the customer's page: only one its version lists, only while
 * the link opens the proposal. Null for anything else (the route answers 404 alike).
 */
export async function proposalPhoto(
	token: string,
	photoId: string,
	now = new Date()
): Promise<StoredFile | null> {
	const db = await getDb();
	const p = await byToken(db, token);
	assertOpenable(p, now);
	if (!(p.snapshot.photos ?? []).some((x) => x.id === photoId)) return null;
	return readPhotoFile(p.companyId, photoId, 'display');
}

export async function openProposal(token: string, now = new Date()): Promise<CustomerProposal> {
	const db = await getDb();
	const p = await byToken(db, token);
	assertOpenable(p, now);
	const [a] = await db.select().from(proposalAnswers).where(eq(proposalAnswers.proposalId, p.id));
	const checkouts = await depositCheckoutsFor(db, p.companyId, p.estimateId);
	return {
		id: p.id,
		version: p.version,
		status: p.status,
		snapshot: p.snapshot,
		answer: a ? publicAnswer(a) : null,
		deposit: depositOf(p.id, checkouts)
	};
}

export type Answer =
	| { decision: 'accepted'; fullName: string; extras: string[] }
	| { decision: 'declined'; reason: string };

/**
 * Records the customer's answer, once. Ticked extras are priced here from the frozen offer
 * (codes only: a price from the browser is never read); the answer keeps the proposal version,
 * the estimate revision and the price as accepted. The unique answer per proposal and the lock
 * on the proposal's row make a second answer, even one at the same moment, a Conflict.
 */
export async function answerProposal(
	token: string,
	answer: Answer,
	meta: { ipAddress: string | null; userAgent: string | null },
	now = new Date()
): Promise<PublicAnswer> {
	const db = await getDb();
	return db.transaction(async (tx) => {
		const p = await byToken(tx, token, true);
		assertOpenable(p, now);
		if (p.status !== 'open') {
			throw new Conflict(`This proposal was already ${p.status}; nothing was changed.`);
		}
		let price = { extras: [] as TickedExtra[], totalCents: p.totalCents, depositCents: 0 };
		if (answer.decision === 'accepted') {
			const offered = new Set(p.snapshot.extras.map((x) => x.code));
			const unknown = answer.extras.filter((c) => !offered.has(c));
			if (unknown.length) {
				throw Invalid.of([{ path: 'extras', message: 'Choose extras from the list.' }]);
			}
			price = priceWithExtras({ ...p, extras: p.snapshot.extras }, answer.extras);
		}
		const [row] = await tx
			.insert(proposalAnswers)
			.values({
				companyId: p.companyId,
				proposalId: p.id,
				decision: answer.decision,
				fullName: answer.decision === 'accepted' ? answer.fullName : null,
				consent: answer.decision === 'accepted',
				extras: price.extras,
				declineReason: answer.decision === 'declined' ? answer.reason || null : null,
				answeredAt: now,
				ipAddress: meta.ipAddress?.slice(0, 100) ?? null,
				userAgent: meta.userAgent?.slice(0, 500) ?? null,
				proposalVersion: p.version,
				estimateDigest: p.estimateDigest,
				totalCents: price.totalCents,
				depositCents: price.depositCents
			})
			.onConflictDoNothing({ target: proposalAnswers.proposalId })
			.returning();
		if (!row) throw new Conflict('This proposal was already answered; nothing was changed.');
		await tx.update(proposals).set({ status: answer.decision }).where(eq(proposals.id, p.id));
		if (answer.decision === 'declined') {
			const moved = await tx
				.update(estimates)
				.set({ status: 'declined' })
				.where(and(eq(estimates.id, p.estimateId), eq(estimates.status, 'sent')))
				.returning({ id: estimates.id });
			if (moved.length) {
				await auditStatus(
					tx,
					p.companyId,
					{ userId: null, name: 'The customer, on the proposal link' },
					p.estimateId,
					'sent',
					'declined'
				);
			}
		}
		return publicAnswer(row);
	});
}

/**
 * Starts (or returns the open) deposit checkout for an accepted proposal. The amount is the
 * deposit recorded with the acceptance, never a figure from the browser. The idempotency key
 * counts the proposal's earlier checkouts, so a double click gets one session and a cancelled
 * payment can be started again.
 */
export async function startDeposit(
	token: string,
	origin: string,
	now = new Date()
): Promise<string> {
	const db = await getDb();
	const p = await byToken(db, token);
	assertOpenable(p, now);
	const [a] = await db.select().from(proposalAnswers).where(eq(proposalAnswers.proposalId, p.id));
	if (!a || a.decision !== 'accepted') {
		throw new Conflict('Accept the proposal first; the deposit follows the acceptance.');
	}
	const checkouts = (await depositCheckoutsFor(db, p.companyId, p.estimateId)).filter((c) =>
		c.idempotencyKey.startsWith(depositKeyPrefix(p.id))
	);
	if (checkouts.some((c) => c.paidAt !== null)) {
		throw new Conflict('The deposit is already paid. Thank you!');
	}
	const open = checkouts.find((c) => c.status === 'open' && c.url);
	if (open) return open.url!;
	const link = new URL(`/p/${token}`, origin).toString();
	const made = await createCheckout(db, getPaymentsClient(), {
		companyId: p.companyId,
		estimateId: p.estimateId,
		amountCents: a.depositCents,
		description: `Deposit — ${p.snapshot.siteAddress} roof cleaning (${formatCents(a.totalCents)} accepted)`,
		customerEmail: p.recipientEmail,
		successUrl: `${link}?deposit=paid`,
		cancelUrl: `${link}?deposit=cancelled`,
		idempotencyKey: `${depositKeyPrefix(p.id)}${checkouts.length + 1}`
	});
	return made.url;
}

/** Inside the webhook's transaction: a paid deposit moves the sent estimate to `accepted`. */
export async function onDepositChange(tx: DbTx, checkout: CheckoutRow): Promise<void> {
	if (checkout.status !== 'complete' || checkout.paidAt === null) return;
	const moved = await tx
		.update(estimates)
		.set({ status: 'accepted' })
		.where(
			and(
				eq(estimates.id, checkout.estimateId),
				eq(estimates.companyId, checkout.companyId),
				eq(estimates.status, 'sent')
			)
		)
		.returning({ id: estimates.id });
	if (moved.length) {
		await auditStatus(
			tx,
			checkout.companyId,
			{ userId: null, name: 'The payment service' },
			checkout.estimateId,
			'sent',
			'accepted',
			'deposit paid'
		);
	}
}
