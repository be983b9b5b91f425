import type Stripe from 'stripe';
import { z } from 'zod';
import type { Db } from '../db';
import { CHECKOUT_KINDS, depositCheckouts } from '../db/schema';
import { PaymentServiceError } from './errors';

export const checkoutInput = z.object({
	/** A proposal's deposit, or a final invoice's balance (which names its invoice). */
	kind: z.enum(CHECKOUT_KINDS).default('deposit'),
	invoiceId: z.uuid().optional(),
	companyId: z.uuid(),
	estimateId: z.uuid(),
	/** The accepted deposit or the balance owed, from the server's records, never the browser. */
	amountCents: z.number().int().min(50).max(10_000_000),
	currency: z
		.string()
		.regex(/^[a-z]{3}$/)
		.default('usd'),
	/** What the customer sees on the pay page, e.g. "Deposit — 14 Tidewater Lane roof cleaning". */
	description: z.string().trim().min(1).max(200),
	customerEmail: z.email().optional(),
	/** May contain {CHECKOUT_SESSION_ID}, which the service fills in. */
	successUrl: z.url({ protocol: /^https?$/ }),
	cancelUrl: z.url({ protocol: /^https?$/ }),
	/** Same key, same request → the same session (e.g. `deposit:${proposalId}:v${version}`). */
	idempotencyKey: z.string().min(8).max(255)
});
export type CheckoutInput = z.input<typeof checkoutInput>;
export type Checkout = { id: string; url: string; status: string };

/**
 * Creates (or, for a key already used, returns) the checkout session for a payment and records
 * it. The row is written only after the service answered, so a failed call leaves nothing.
 */
export async function createCheckout(
	db: Db,
	stripe: Stripe,
	input: CheckoutInput
): Promise<Checkout> {
	const p = checkoutInput.parse(input);
	let session: Stripe.Checkout.Session;
	try {
		session = await stripe.checkout.sessions.create(
			{
				mode: 'payment',
				line_items: [
					{
						quantity: 1,
						price_data: {
							currency: p.currency,
							unit_amount: p.amountCents,
							product_data: { name: p.description }
						}
					}
				],
				client_reference_id: p.estimateId,
				customer_email: p.customerEmail,
				metadata: {
					kind: p.kind,
					companyId: p.companyId,
					estimateId: p.estimateId,
					...(p.invoiceId ? { invoiceId: p.invoiceId } : {}),
					idempotencyKey: p.idempotencyKey
				},
				success_url: p.successUrl,
				cancel_url: p.cancelUrl
			},
			{ idempotencyKey: p.idempotencyKey }
		);
	} catch (e) {
		throw asServiceError(e);
	}
	if (session.amount_total !== p.amountCents || !session.url) {
		throw new PaymentServiceError(
			'The payment service answered with a different amount or no pay page; nothing was stored.',
			'refused'
		);
	}
	// A webhook may have recorded it already (it can arrive before this answer): keep that.
	await db
		.insert(depositCheckouts)
		.values({
			id: session.id,
			kind: p.kind,
			invoiceId: p.invoiceId ?? null,
			companyId: p.companyId,
			estimateId: p.estimateId,
			amountCents: p.amountCents,
			currency: p.currency,
			idempotencyKey: p.idempotencyKey,
			status: 'open',
			url: session.url
		})
		.onConflictDoNothing({ target: depositCheckouts.id });
	return { id: session.id, url: session.url, status: session.status ?? 'open' };
}

function asServiceError(e: unknown): PaymentServiceError {
	const type = (e as { type?: string }).type;
	if (type === 'StripeConnectionError') {
		return new PaymentServiceError(
			'The payment service could not be reached; nothing was charged. Try again in a moment.',
			'unreachable',
			{ cause: e }
		);
	}
	if (type === 'StripeIdempotencyError') {
		return new PaymentServiceError(
			'This payment was already started with different details; start a new one.',
			'idempotency',
			{ cause: e }
		);
	}
	return new PaymentServiceError(
		`The payment service refused the request: ${(e as Error).message}`,
		'refused',
		{ cause: e }
	);
}
