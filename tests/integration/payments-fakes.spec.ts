// The fakes as the demo and later route tests use them: both started on free ports by the test
// helper, the built server started with their settings (and the new tables migrated), mail
// through the SMTP fake and a payment on the fake's page, all on 127.0.0.1.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createMailTransport } from '$lib/server/mail';
import { createPaymentsClient } from '$lib/server/payments';
import { startTestFakes, TEST_WEBHOOK_SECRET, type TestFakes } from '../helpers/fakes';
import { seededDataDir, startServer, type TestServer } from '../helpers/server';

let fakes: TestFakes;
let server: TestServer;

beforeAll(async () => {
	fakes = await startTestFakes();
	server = await startServer(seededDataDir('fakes'), fakes.env);
	fakes.payments.setWebhookUrl(`${server.url}/api/payments/webhook`);
});

afterAll(async () => {
	await server?.stop();
	await fakes?.stop();
});

describe('local fakes beside the built server', () => {
	it('the server starts with the fakes settings and its new tables migrated', async () => {
		const r = await fetch(`${server.url}/api/health`);
		expect(r.status).toBe(200);
		expect(new URL(fakes.smtp.url).hostname).toBe('127.0.0.1');
		expect(new URL(fakes.payments.url).hostname).toBe('127.0.0.1');
	});

	it('the SMTP fake takes mail on its address and shows it on its inbox endpoint', async () => {
		const t = createMailTransport(fakes.env.CLEARPITCH_SMTP_URL)!;
		await t.sendMail({
			from: 'office@harborpine.example',
			to: 'marisol.quenby@wrenfield.example',
			subject: 'Site visit on Tuesday',
			text: 'We will be at 14 Tidewater Lane at 9 am.'
		});
		const inbox = (await (await fetch(fakes.env.CLEARPITCH_MAIL_FAKE_INBOX_URL)).json()) as {
			subject: string;
			text: string;
		}[];
		expect(inbox.map((m) => m.subject)).toEqual(['Site visit on Tuesday']);
		expect(inbox[0].text.trim()).toBe('We will be at 14 Tidewater Lane at 9 am.');
	});

	it('the payments fake refuses a wrong key and sends a signed event on Pay', async () => {
		const bad = await fetch(`${fakes.payments.url}/v1/checkout/sessions`, {
			method: 'POST',
			headers: { authorization: 'Bearer pk_wrong' },
			body: 'mode=payment'
		});
		expect(bad.status).toBe(401);

		const stripe = createPaymentsClient({
			mode: 'local-fake',
			secretKey: 'sk_test_fakes_spec',
			webhookSecret: TEST_WEBHOOK_SECRET,
			fakeUrl: new URL(fakes.payments.url)
		});
		const s = await stripe.checkout.sessions.create({
			mode: 'payment',
			line_items: [
				{
					quantity: 1,
					price_data: { currency: 'usd', unit_amount: 5_000, product_data: { name: 'Deposit' } }
				}
			],
			success_url: `${server.url}/done`,
			cancel_url: `${server.url}/back`
		});
		const event = await fakes.payments.pay(s.id);
		expect(event.type).toBe('checkout.session.completed');
		// The server has no webhook route yet (it is added with the routes), so the delivery was
		// made to it and answered, not lost in the fake.
		const d = fakes.payments.deliveries().find((x) => x.eventId === event.id);
		expect(d?.status).not.toBeNull();
		expect((await stripe.checkout.sessions.retrieve(s.id)).status).toBe('complete');
	});
});
