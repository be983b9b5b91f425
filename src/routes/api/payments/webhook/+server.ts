import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { applyPaymentEvent, verifyWebhook, WebhookSignatureError } from '$lib/server/payments';
import { onBalanceChange } from '$lib/server/services/balance';
import { onDepositChange } from '$lib/server/services/proposals';
import type { RequestHandler } from './$types';

/** The largest event body accepted; a checkout session event is a few kilobytes. */
const MAX_BYTES = 256 * 1024;

/**
 * The payment service's webhook (a PUBLIC row: the service has no account; the signature is
 * the check). The signature is verified on the exact raw body; a bad one answers 400 and
 * changes nothing. A replayed or duplicated event answers 200 and changes nothing twice.
 */
export const POST: RequestHandler = async ({ request }) => {
	const length = Number(request.headers.get('content-length') ?? '0');
	if (length > MAX_BYTES) return json({ message: 'The event is too large.' }, { status: 413 });
	const raw = await request.text();
	if (raw.length > MAX_BYTES) return json({ message: 'The event is too large.' }, { status: 413 });
	let event;
	try {
		event = verifyWebhook(raw, request.headers.get('stripe-signature'));
	} catch (e) {
		if (e instanceof WebhookSignatureError) return json({ message: e.message }, { status: 400 });
		throw e;
	}
	const r = await applyPaymentEvent(await getDb(), event, (tx, checkout) =>
		checkout.kind === 'balance' ? onBalanceChange(tx, checkout) : onDepositChange(tx, checkout)
	);
	return json({ received: true, outcome: r.outcome });
};
