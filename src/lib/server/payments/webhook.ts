import Stripe from 'stripe';
import { env } from '../env';
import { WebhookSignatureError } from './errors';

/**
 * Checks a webhook's Stripe-Signature header against the exact raw body and the configured
 * secret (HMAC-SHA256, 300 s tolerance, via the SDK's constructEvent) and returns the event.
 * Pass the body as received (`await request.text()`), never re-serialised JSON.
 */
export function verifyWebhook(
	rawBody: string | Buffer,
	signatureHeader: string | null | undefined,
	secret: string = env.payments.webhookSecret
): Stripe.Event {
	if (!signatureHeader) throw new WebhookSignatureError('The Stripe-Signature header is missing.');
	try {
		return Stripe.webhooks.constructEvent(rawBody, signatureHeader, secret) as Stripe.Event;
	} catch (e) {
		throw new WebhookSignatureError(
			`The webhook signature does not check out: ${(e as Error).message}`
		);
	}
}
