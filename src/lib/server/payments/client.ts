import Stripe from 'stripe';
import { env, type PaymentSettings } from '../env';

/**
 * The payment service's official SDK. With a real secret key it talks to the real service;
 * without one, to the local fake (CLEARPITCH_PAYMENTS_FAKE_URL), through the SDK's own
 * host/port/protocol settings, so no code changes between the two.
 */
export function createPaymentsClient(settings: PaymentSettings = env.payments): Stripe {
	const common = { maxNetworkRetries: 2, timeout: 20_000 };
	if (settings.mode === 'live-service') return new Stripe(settings.secretKey, common);
	const url = settings.fakeUrl!;
	return new Stripe(settings.secretKey, {
		...common,
		host: url.hostname,
		port: Number(url.port || 80),
		protocol: 'http'
	});
}

let client: Stripe | undefined;

/** One client for the process, made from the environment on first use. */
export function getPaymentsClient(): Stripe {
	client ??= createPaymentsClient();
	return client;
}
