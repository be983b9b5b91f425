import { randomUUID } from 'node:crypto';
import { and, asc, desc, eq, inArray, lte } from 'drizzle-orm';
import type { Db } from '../db';
import { mailOutbox, type MailStatus } from '../db/schema';
import { DEFAULT_RETRY, retryDelayMs, type RetryPolicy } from './backoff';
import { oneLine } from './html';
import type { MailTransport } from './transport';

export type OutboxMessage = {
	companyId: string;
	/** The same key never makes a second message (e.g. `proposal:${id}:v${version}`). */
	idempotencyKey: string;
	from: string;
	to: string;
	subject: string;
	text: string;
	html: string;
	subjectKind?: string | null;
	subjectId?: string | null;
};

export type OutboxRow = typeof mailOutbox.$inferSelect;

/** A transaction of Db: enqueueing with the row that the message is about commits both or neither. */
export type DbTx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** A try that ends in "sending" and never reports back is picked up again after this. */
const LEASE_MS = 5 * 60_000;
const DUE: MailStatus[] = ['queued', 'failed', 'sending'];

/**
 * Writes the message to the outbox (nothing is sent yet), in `db` or inside a transaction. A second call with the same key
 * returns the first message untouched, with `created: false`.
 */
export async function enqueueMail(
	db: Db | DbTx,
	m: OutboxMessage,
	now = new Date()
): Promise<{ id: string; created: boolean; status: MailStatus }> {
	const inserted = await db
		.insert(mailOutbox)
		.values({
			companyId: m.companyId,
			idempotencyKey: m.idempotencyKey,
			subjectKind: m.subjectKind ?? null,
			subjectId: m.subjectId ?? null,
			fromAddress: oneLine(m.from),
			toAddress: oneLine(m.to),
			subject: oneLine(m.subject),
			textBody: m.text,
			htmlBody: m.html,
			nextAttemptAt: now,
			messageId: `<${randomUUID()}@${domainOf(m.from)}>`
		})
		.onConflictDoNothing({ target: [mailOutbox.companyId, mailOutbox.idempotencyKey] })
		.returning({ id: mailOutbox.id, status: mailOutbox.status });
	if (inserted.length) return { ...inserted[0], created: true };
	const [existing] = await db
		.select({ id: mailOutbox.id, status: mailOutbox.status })
		.from(mailOutbox)
		.where(
			and(eq(mailOutbox.companyId, m.companyId), eq(mailOutbox.idempotencyKey, m.idempotencyKey))
		);
	return { ...existing, created: false };
}

export type SendOptions = { now?: Date; policy?: RetryPolicy };

/**
 * Tries one message now if it is due (a message already sent, or claimed by another run, is
 * left alone). SMTP 5xx answers are permanent (RFC 5321 §4.2.1: the client should not repeat
 * the request) and mark it "dead" at once; 4xx answers and network errors are retried later.
 */
export async function sendQueuedMail(
	db: Db,
	transport: MailTransport | null,
	id: string,
	opts: SendOptions = {}
): Promise<MailStatus | null> {
	const now = opts.now ?? new Date();
	const policy = opts.policy ?? DEFAULT_RETRY;
	const [row] = await db
		.update(mailOutbox)
		.set({ status: 'sending', nextAttemptAt: new Date(now.getTime() + LEASE_MS) })
		.where(
			and(
				eq(mailOutbox.id, id),
				inArray(mailOutbox.status, DUE),
				lte(mailOutbox.nextAttemptAt, now)
			)
		)
		.returning();
	if (!row) return null;
	const attempts = row.attempts + 1;
	try {
		if (!transport) throw new Error('No SMTP server is configured (set CLEARPITCH_SMTP_URL).');
		await transport.sendMail({
			from: row.fromAddress,
			to: row.toAddress,
			subject: row.subject,
			text: row.textBody,
			html: row.htmlBody,
			messageId: row.messageId,
			headers: { 'X-Clearpitch-Outbox': row.id }
		});
		await db
			.update(mailOutbox)
			.set({ status: 'sent', attempts, sentAt: new Date(), lastError: null })
			.where(eq(mailOutbox.id, id));
		return 'sent';
	} catch (e) {
		const code = (e as { responseCode?: number }).responseCode;
		const permanent = typeof code === 'number' && code >= 500 && code < 600;
		const dead = permanent || attempts >= policy.maxAttempts;
		await db
			.update(mailOutbox)
			.set({
				status: dead ? 'dead' : 'failed',
				attempts,
				lastError: describe(e).slice(0, 1000),
				nextAttemptAt: new Date(now.getTime() + (dead ? 0 : retryDelayMs(attempts, policy)))
			})
			.where(eq(mailOutbox.id, id));
		return dead ? 'dead' : 'failed';
	}
}

/** One pass of the retry loop: tries every due message, oldest first. */
export async function sendDueMail(
	db: Db,
	transport: MailTransport | null,
	opts: SendOptions & { limit?: number } = {}
): Promise<Record<'sent' | 'failed' | 'dead', number>> {
	const now = opts.now ?? new Date();
	const due = await db
		.select({ id: mailOutbox.id })
		.from(mailOutbox)
		.where(and(inArray(mailOutbox.status, DUE), lte(mailOutbox.nextAttemptAt, now)))
		.orderBy(asc(mailOutbox.nextAttemptAt))
		.limit(opts.limit ?? 20);
	const counts = { sent: 0, failed: 0, dead: 0 };
	for (const { id } of due) {
		const status = await sendQueuedMail(db, transport, id, { ...opts, now });
		if (status === 'sent' || status === 'failed' || status === 'dead') counts[status]++;
	}
	return counts;
}

/** Puts a dead or failed message back in line to be tried at once (a person asked for it). */
export async function retryMailNow(db: Db, companyId: string, id: string): Promise<boolean> {
	const rows = await db
		.update(mailOutbox)
		.set({ status: 'queued', nextAttemptAt: new Date() })
		.where(
			and(
				eq(mailOutbox.id, id),
				eq(mailOutbox.companyId, companyId),
				inArray(mailOutbox.status, ['failed', 'dead'])
			)
		)
		.returning({ id: mailOutbox.id });
	return rows.length === 1;
}

/** A company's messages, newest first, optionally about one thing (e.g. one proposal). */
export async function listOutbox(
	db: Db,
	companyId: string,
	about?: { kind: string; id: string }
): Promise<OutboxRow[]> {
	const where = about
		? and(
				eq(mailOutbox.companyId, companyId),
				eq(mailOutbox.subjectKind, about.kind),
				eq(mailOutbox.subjectId, about.id)
			)
		: eq(mailOutbox.companyId, companyId);
	return db.select().from(mailOutbox).where(where).orderBy(desc(mailOutbox.createdAt)).limit(200);
}

/**
 * Calls `sendDueMail` every `intervalMs` (never two passes at once); the server starts it at
 * boot and stops it on shutdown. A pass that throws is logged and the next one goes on.
 */
export function startMailRetryLoop(opts: {
	db: () => Promise<Db>;
	transport: MailTransport | null;
	intervalMs?: number;
	policy?: RetryPolicy;
	onError?: (e: unknown) => void;
}): { stop: () => void; runNow: () => Promise<void> } {
	let running: Promise<void> | null = null;
	const pass = () => {
		running ??= (async () => {
			try {
				await sendDueMail(await opts.db(), opts.transport, { policy: opts.policy });
			} catch (e) {
				(opts.onError ?? ((x) => console.error('Mail retry pass failed:', x)))(e);
			} finally {
				running = null;
			}
		})();
		return running;
	};
	const timer = setInterval(pass, opts.intervalMs ?? 30_000);
	timer.unref();
	return { stop: () => clearInterval(timer), runNow: pass };
}

function describe(e: unknown): string {
	if (!(e instanceof Error)) return String(e);
	const code = (e as { responseCode?: number }).responseCode;
	return code ? `SMTP ${code}: ${e.message}` : e.message;
}

function domainOf(address: string): string {
	const m = /@([A-Za-z0-9.-]+)>?\s*$/.exec(address);
	return m ? m[1] : 'clearpitch.example';
}
