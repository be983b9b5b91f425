export { createPaymentsClient, getPaymentsClient } from './client';
export { createCheckout, type Checkout, type CheckoutInput } from './checkout';
export { PaymentServiceError, WebhookSignatureError } from './errors';
export {
	applyPaymentEvent,
	depositCheckoutsFor,
	type CheckoutRow,
	type EventOutcome
} from './events';
export { verifyWebhook } from './webhook';
