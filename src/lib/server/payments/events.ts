import { and, eq } from 'drizzle-orm';
import type Stripe from 'stripe';
import type { Db } from '../db';
import { depositCheckouts, estimates, paymentEvents } from '../db/schema';

export type CheckoutRow = typeof depositCheckouts.$inferSelect;
type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

export type EventOutcome =
	/** First delivery; the checkout changed (`checkout` is its new state). */
	| 'applied'
	/** First delivery, but it is older news than what is recorded (e.g. expired after paid). */
	| 'ignored'
	/** Not about one of our deposits. */
	| 'unrelated'
	/** Delivered before: nothing changed. */
	| 'duplicate';

/**
 * Applies a verified webhook event once. The event id is stored in the same transaction as its
 * effect, so a replayed or duplicated delivery changes nothing twice. Order does not matter: a
 * paid checkout stays paid whatever arrives after, and an event that beats our own record of
 * the checkout creates it from the event's data. `onChange` runs inside the transaction when
 * the checkout changed (move the estimate there, with `tx` only). A deposit names its estimate;
 * a balance names its invoice too.
 */
export async function applyPaymentEvent(
	db: Db,
	event: Stripe.Event,
	onChange?: (tx: Tx, checkout: CheckoutRow, event: Stripe.Event) => Promise<void>
): Promise<{ outcome: EventOutcome; checkout: CheckoutRow | null }> {
	return db.transaction(async (tx) => {
		const session = checkoutSessionOf(event);
		const meta = session?.metadata ?? {};
		const companyId = isUuid(meta.companyId) ? meta.companyId : null;
		const first = await tx
			.insert(paymentEvents)
			.values({
				id: event.id,
				companyId: null,
				type: event.type,
				objectId: session?.id ?? null,
				serviceCreated: event.created,
				outcome: 'pending'
			})
			.onConflictDoNothing({ target: paymentEvents.id })
			.returning({ id: paymentEvents.id });
		if (!first.length) return { outcome: 'duplicate' as const, checkout: null };

		let outcome: EventOutcome = 'unrelated';
		let checkout: CheckoutRow | null = null;
		const target = targetState(event);
		const estimateId = meta.estimateId;
		const kind = meta.kind === 'deposit' || meta.kind === 'balance' ? meta.kind : null;
		const invoiceId = kind === 'balance' && isUuid(meta.invoiceId) ? meta.invoiceId : null;
		if (
			session &&
			target &&
			kind &&
			(kind === 'deposit' || invoiceId) &&
			companyId &&
			isUuid(estimateId)
		) {
			const [estimate] = await tx
				.select({ id: estimates.id })
				.from(estimates)
				.where(and(eq(estimates.id, estimateId), eq(estimates.companyId, companyId)));
			if (estimate) {
				({ outcome, checkout } = await applyState(tx, session, target, event.created, {
					companyId,
					estimateId,
					kind,
					invoiceId
				}));
				if (outcome === 'applied' && onChange) await onChange(tx, checkout!, event);
			}
		}
		await tx
			.update(paymentEvents)
			.set({ outcome, companyId: outcome === 'unrelated' ? null : companyId })
			.where(eq(paymentEvents.id, event.id));
		return { outcome, checkout };
	});
}

type Target = { status: 'complete' | 'expired'; paid: boolean };

function targetState(event: Stripe.Event): Target | null {
	const s = checkoutSessionOf(event);
	if (!s) return null;
	switch (event.type) {
		case 'checkout.session.completed':
		case 'checkout.session.async_payment_succeeded':
			return { status: 'complete', paid: s.payment_status === 'paid' };
		case 'checkout.session.expired':
			return { status: 'expired', paid: false };
		default:
			return null;
	}
}

async function applyState(
	tx: Tx,
	s: Stripe.Checkout.Session,
	target: Target,
	at: number,
	ids: {
		companyId: string;
		estimateId: string;
		kind: 'deposit' | 'balance';
		invoiceId: string | null;
	}
): Promise<{ outcome: EventOutcome; checkout: CheckoutRow }> {
	const paidFields = target.paid
		? { amountPaidCents: s.amount_total ?? 0, paidAt: new Date(at * 1000) }
		: {};
	const [existing] = await tx.select().from(depositCheckouts).where(eq(depositCheckouts.id, s.id));
	if (!existing) {
		const [row] = await tx
			.insert(depositCheckouts)
			.values({
				id: s.id,
				...ids,
				amountCents: s.amount_total ?? 0,
				currency: s.currency ?? 'usd',
				idempotencyKey: s.metadata?.idempotencyKey ?? '',
				status: target.status,
				url: s.url ?? null,
				...paidFields
			})
			.returning();
		return { outcome: 'applied', checkout: row };
	}
	// complete is final; paid is final; expired never undoes either.
	const alreadyPaid = existing.paidAt !== null;
	const moves =
		existing.status === 'open' ||
		(existing.status === 'expired' && target.status === 'complete') ||
		(existing.status === 'complete' && target.status === 'complete' && target.paid && !alreadyPaid);
	if (!moves) return { outcome: 'ignored', checkout: existing };
	const [row] = await tx
		.update(depositCheckouts)
		.set({ status: target.status, ...paidFields })
		.where(eq(depositCheckouts.id, s.id))
		.returning();
	return { outcome: 'applied', checkout: row };
}

function checkoutSessionOf(event: Stripe.Event): Stripe.Checkout.Session | null {
	const o = (event.data as { object?: { object?: string } }).object;
	return o && o.object === 'checkout.session' ? (o as Stripe.Checkout.Session) : null;
}

function isUuid(v: unknown): v is string {
	return (
		typeof v === 'string' &&
		/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(v)
	);
}

/** The recorded checkouts of one estimate, newest first. */
export async function depositCheckoutsFor(
	db: Db,
	companyId: string,
	estimateId: string
): Promise<CheckoutRow[]> {
	const rows = await db
		.select()
		.from(depositCheckouts)
		.where(
			and(eq(depositCheckouts.companyId, companyId), eq(depositCheckouts.estimateId, estimateId))
		);
	return rows.sort((a, b) => b.createdAt.getTime() - a.createdAt.getTime());
}
