export { createPaymentsClient, getPaymentsClient } from './client';
export {
	createDepositCheckout,
	depositCheckoutInput,
	type DepositCheckout,
	type DepositCheckoutInput
} from './checkout';
export { PaymentServiceError, WebhookSignatureError } from './errors';
export {
	applyPaymentEvent,
	depositCheckoutsFor,
	type CheckoutRow,
	type EventOutcome
} from './events';
export { verifyWebhook } from './webhook';
