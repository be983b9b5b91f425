import os from 'node:os';
import path from 'node:path';
import { startPaymentsFake, type PaymentsFake } from '../../src/lib/server/fakes/payments';
import { startSmtpFake, type SmtpFake } from '../../src/lib/server/fakes/smtp';

export const TEST_WEBHOOK_SECRET = 'whsec_test_clearpitch_helpers';

export type TestFakes = {
	smtp: SmtpFake;
	payments: PaymentsFake;
	/** Pass to startServer(dataDir, env) so the built server uses these fakes. */
	env: Record<string, string>;
	stop(): Promise<void>;
};

/**
 * Starts the SMTP and payments fakes on free ports of 127.0.0.1 for one test file. The payments
 * fake posts its events to `webhookUrl`; call `payments.setWebhookUrl` once the server's port is
 * known if it is not yet.
 */
export async function startTestFakes(webhookUrl = 'http://127.0.0.1:9/unset'): Promise<TestFakes> {
	const smtp = await startSmtpFake({
		storeFile: path.join(os.tmpdir(), `clearpitch-mail-${process.pid}-${Date.now()}.json`)
	});
	const payments = await startPaymentsFake({ webhookUrl, webhookSecret: TEST_WEBHOOK_SECRET });
	return {
		smtp,
		payments,
		env: {
			CLEARPITCH_SMTP_URL: smtp.url,
			CLEARPITCH_MAIL_FAKE_INBOX_URL: smtp.inboxUrl,
			CLEARPITCH_PAYMENTS_FAKE_URL: payments.url,
			STRIPE_WEBHOOK_SECRET: TEST_WEBHOOK_SECRET,
			STRIPE_SECRET_KEY: ''
		},
		stop: async () => {
			await Promise.all([smtp.close(), payments.close()]);
		}
	};
}
