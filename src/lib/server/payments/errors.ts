/** The payment service could not do what was asked; nothing was charged and nothing stored. */
export class PaymentServiceError extends Error {
	override name = 'PaymentServiceError';
	constructor(
		message: string,
		readonly kind: 'unreachable' | 'refused' | 'idempotency',
		options?: { cause?: unknown }
	) {
		super(message, options);
	}
}

/** A webhook whose signature does not check out; the route answers 400 and changes nothing. */
export class WebhookSignatureError extends Error {
	override name = 'WebhookSignatureError';
}
