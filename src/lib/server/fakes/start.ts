// Both local fakes at once, with the environment the app needs to use them. For the demo, the
// fakes script and the tests; never started in production (real settings switch them off).
import path from 'node:path';
import { env, FAKE_WEBHOOK_SECRET } from '../env';
import { startPaymentsFake, type PaymentsFake } from './payments';
import { startSmtpFake, type SmtpFake } from './smtp';

export type Fakes = {
	smtp: SmtpFake | null;
	payments: PaymentsFake | null;
	/** Settings for the app's process so it uses the fakes that were started. */
	appEnv: Record<string, string>;
	describe(): string[];
	close(): Promise<void>;
};

export const DEFAULT_FAKE_PORTS = { smtp: 2525, smtpInbox: 2526, payments: 12111 };

/**
 * Starts the fakes that real settings do not replace: no SMTP fake when CLEARPITCH_SMTP_URL is
 * set, no payments fake when STRIPE_SECRET_KEY is. Port 0 picks free ports (tests).
 */
export async function startFakes(
	opts: {
		smtpPort?: number;
		smtpInboxPort?: number;
		paymentsPort?: number;
		webhookUrl?: string;
		webhookSecret?: string;
		mailStoreFile?: string;
	} = {}
): Promise<Fakes> {
	const port = (name: string, fallback: number) => {
		const v = process.env[name];
		return v ? Number(v) : fallback;
	};
	const appEnv: Record<string, string> = {};
	let smtp: SmtpFake | null = null;
	let payments: PaymentsFake | null = null;
	try {
		if (!process.env.CLEARPITCH_SMTP_URL) {
			smtp = await startSmtpFake({
				port: opts.smtpPort ?? port('CLEARPITCH_FAKE_SMTP_PORT', DEFAULT_FAKE_PORTS.smtp),
				httpPort:
					opts.smtpInboxPort ??
					port('CLEARPITCH_FAKE_SMTP_INBOX_PORT', DEFAULT_FAKE_PORTS.smtpInbox),
				storeFile: opts.mailStoreFile ?? path.join(env.dataDir, 'fake-mail', 'received.json')
			});
			appEnv.CLEARPITCH_SMTP_URL = smtp.url;
			appEnv.CLEARPITCH_MAIL_FAKE_INBOX_URL = smtp.inboxUrl;
		}
		if (!process.env.STRIPE_SECRET_KEY) {
			const webhookSecret =
				opts.webhookSecret ?? (process.env.STRIPE_WEBHOOK_SECRET || FAKE_WEBHOOK_SECRET);
			payments = await startPaymentsFake({
				port:
					opts.paymentsPort ?? port('CLEARPITCH_FAKE_PAYMENTS_PORT', DEFAULT_FAKE_PORTS.payments),
				webhookUrl: opts.webhookUrl ?? env.paymentsWebhookUrl,
				webhookSecret
			});
			appEnv.CLEARPITCH_PAYMENTS_FAKE_URL = payments.url;
			appEnv.STRIPE_WEBHOOK_SECRET = webhookSecret;
		}
	} catch (e) {
		await smtp?.close();
		throw e;
	}
	return {
		smtp,
		payments,
		appEnv,
		describe: () => [
			smtp
				? `Mail fake:     ${smtp.url} (received messages: ${smtp.inboxUrl})`
				: 'Mail:          real SMTP server from CLEARPITCH_SMTP_URL',
			payments
				? `Payments fake: ${payments.url} (events go to ${env.paymentsWebhookUrl})`
				: 'Payments:      real service (STRIPE_SECRET_KEY is set)'
		],
		close: async () => {
			await Promise.all([smtp?.close(), payments?.close()]);
		}
	};
}
