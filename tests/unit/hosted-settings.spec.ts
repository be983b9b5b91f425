// The hosted-service settings read from the environment: defaults, and a clear ConfigError for
// a value Clearpitch cannot run with.
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { ConfigError, env, FAKE_WEBHOOK_SECRET } from '$lib/server/env';

const saved = { ...process.env };
afterEach(() => {
	process.env = { ...saved };
});

function set(vars: Record<string, string | undefined>) {
	for (const [k, v] of Object.entries(vars)) {
		if (v === undefined) delete process.env[k];
		else process.env[k] = v;
	}
}

describe('file storage settings', () => {
	it('stores files under the data directory by default, or where told', () => {
		set({ CLEARPITCH_DATA_DIR: '/srv/cp/pglite', CLEARPITCH_FILES_DIR: undefined });
		expect(env.filesDir).toBe(path.join('/srv/cp/pglite', 'files'));
		set({ CLEARPITCH_FILES_DIR: '/mnt/uploads' });
		expect(env.filesDir).toBe('/mnt/uploads');
	});

	it('uses a bucket only when one is named, and wants both keys or neither', () => {
		set({ CLEARPITCH_S3_BUCKET: undefined });
		expect(env.s3).toBeNull();
		set({
			CLEARPITCH_S3_BUCKET: 'harbor-pine-files',
			CLEARPITCH_S3_ENDPOINT: 'http://127.0.0.1:9000',
			CLEARPITCH_S3_PATH_STYLE: '1',
			CLEARPITCH_S3_ACCESS_KEY_ID: 'id',
			CLEARPITCH_S3_SECRET_ACCESS_KEY: 'secret'
		});
		expect(env.s3).toMatchObject({
			bucket: 'harbor-pine-files',
			forcePathStyle: true,
			region: 'us-east-1'
		});
		set({ CLEARPITCH_S3_SECRET_ACCESS_KEY: undefined });
		expect(() => env.s3).toThrow(ConfigError);
		set({ CLEARPITCH_S3_SECRET_ACCESS_KEY: 'secret', CLEARPITCH_S3_ENDPOINT: 'ftp://x' });
		expect(() => env.s3).toThrow(/CLEARPITCH_S3_ENDPOINT/);
	});

	it('caps photos at 15 MB and 50 megapixels unless set, and refuses nonsense', () => {
		set({ CLEARPITCH_PHOTO_MAX_MB: undefined, CLEARPITCH_PHOTO_MAX_MEGAPIXELS: undefined });
		expect(env.photoMaxBytes).toBe(15 * 1024 * 1024);
		expect(env.photoMaxPixels).toBe(50_000_000);
		set({ CLEARPITCH_PHOTO_MAX_MB: '2.5' });
		expect(env.photoMaxBytes).toBe(2.5 * 1024 * 1024);
		for (const bad of ['0', '-1', 'lots', '1e9']) {
			set({ CLEARPITCH_PHOTO_MAX_MB: bad });
			expect(() => env.photoMaxBytes).toThrow(ConfigError);
		}
	});
});

describe('mail and payment settings', () => {
	it('takes only smtp:// or smtps:// addresses', () => {
		set({ CLEARPITCH_SMTP_URL: undefined });
		expect(env.smtpUrl).toBeNull();
		set({ CLEARPITCH_SMTP_URL: 'smtps://u:p@mail.harborpine.example:465' });
		expect(env.smtpUrl).toBe('smtps://u:p@mail.harborpine.example:465');
		set({ CLEARPITCH_SMTP_URL: 'http://mail.example' });
		expect(() => env.smtpUrl).toThrow(ConfigError);
	});

	it('uses the local fake without a real key, and needs the webhook secret with one', () => {
		set({
			STRIPE_SECRET_KEY: undefined,
			STRIPE_WEBHOOK_SECRET: undefined,
			CLEARPITCH_PAYMENTS_FAKE_URL: undefined
		});
		const fake = env.payments;
		expect(fake.mode).toBe('local-fake');
		expect(fake.fakeUrl?.toString()).toBe('http://127.0.0.1:12111/');
		expect(fake.webhookSecret).toBe(FAKE_WEBHOOK_SECRET);
		set({ STRIPE_SECRET_KEY: 'sk_live_example' });
		expect(() => env.payments).toThrow(/STRIPE_WEBHOOK_SECRET/);
		set({ STRIPE_WEBHOOK_SECRET: 'whsec_example' });
		expect(env.payments).toMatchObject({
			mode: 'live-service',
			fakeUrl: null,
			webhookSecret: 'whsec_example'
		});
	});
});
