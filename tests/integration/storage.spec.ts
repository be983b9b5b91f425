// The storage module's contract, run the same way against local disk and against an
// S3-compatible server (s3rver, in process, on 127.0.0.1) through @aws-sdk/client-s3.
import fs from 'node:fs';
import path from 'node:path';
import S3rver from 's3rver';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DiskStorage, S3Storage, StorageKeyError, newKey, type Storage } from '$lib/server/storage';
import { freePort } from '../helpers/server';

const root = path.resolve('tmp/storage', `run-${process.pid}-${Date.now()}`);
let s3server: S3rver;
let s3: S3Storage;

beforeAll(async () => {
	const port = await freePort();
	s3server = new S3rver({
		address: '127.0.0.1',
		port,
		silent: true,
		directory: path.join(root, 's3rver'),
		configureBuckets: [{ name: 'clearpitch-test', configs: [] }]
	});
	await s3server.run();
	s3 = new S3Storage({
		bucket: 'clearpitch-test',
		endpoint: `http://127.0.0.1:${port}`,
		region: 'us-east-1',
		// s3rver's documented fixed credentials.
		accessKeyId: 'S3RVER',
		secretAccessKey: 'S3RVER',
		forcePathStyle: true,
		prefix: 'files/'
	});
});

afterAll(async () => {
	s3?.client.destroy();
	await s3server?.close();
	fs.rmSync(root, { recursive: true, force: true });
});

const stores: [string, () => Storage][] = [
	['local disk', () => new DiskStorage(path.join(root, 'disk'))],
	['S3-compatible bucket', () => s3]
];

describe.each(stores)('storage on %s', (_name, store) => {
	it('puts, reads back byte for byte, tells it exists, deletes', async () => {
		const key = newKey('photos', 'company-1');
		const bytes = new Uint8Array(70_000).map((_, i) => (i * 31) % 256);
		expect(await store().exists(key)).toBe(false);
		expect(await store().get(key)).toBeNull();

		await store().put(key, bytes, 'image/jpeg');
		expect(await store().exists(key)).toBe(true);
		const back = await store().get(key);
		expect(back?.contentType).toBe('image/jpeg');
		expect(back?.size).toBe(bytes.length);
		expect(Buffer.compare(back!.bytes, Buffer.from(bytes))).toBe(0);

		await store().delete(key);
		expect(await store().exists(key)).toBe(false);
		expect(await store().get(key)).toBeNull();
		// Deleting what is gone is not an error.
		await expect(store().delete(key)).resolves.toBeUndefined();
	});

	it('replaces a file whole when the same key is put again', async () => {
		const key = newKey('photos');
		await store().put(key, Buffer.from('first version'), 'text/plain');
		await store().put(key, Buffer.from('second'), 'image/png');
		const back = await store().get(key);
		expect(back?.bytes.toString()).toBe('second');
		expect(back?.contentType).toBe('image/png');
	});

	it.each(['../outside', 'photos/../../etc/passwd', 'roof photo.jpg', '', 'a//b', '/abs', 'x.y'])(
		'refuses the key %j and stores nothing',
		async (bad) => {
			await expect(store().put(bad, Buffer.from('x'), 'text/plain')).rejects.toBeInstanceOf(
				StorageKeyError
			);
			await expect(store().get(bad)).rejects.toBeInstanceOf(StorageKeyError);
			await expect(store().exists(bad)).rejects.toBeInstanceOf(StorageKeyError);
		}
	);
});

describe('local disk specifics', () => {
	it('leaves no temporary file behind and writes only under its root', async () => {
		const dir = path.join(root, 'disk-only');
		const disk = new DiskStorage(dir);
		const key = newKey('photos', 'c1');
		await disk.put(key, Buffer.from('roof'), 'image/jpeg');
		const files = fs.readdirSync(path.join(dir, 'photos', 'c1'));
		expect(files.sort()).toEqual([key.split('/')[2], `${key.split('/')[2]}.type`].sort());
		expect(files.some((f) => f.startsWith('.tmp-'))).toBe(false);
	});

	it('removes its temporary file when a put cannot finish', async () => {
		const dir = path.join(root, 'disk-fail');
		const disk = new DiskStorage(dir);
		const key = newKey('photos');
		await disk.put(key, Buffer.from('good copy'), 'image/jpeg');
		// A directory in the way of the temporary file's rename makes the write fail half way.
		const target = path.join(dir, ...key.split('/'));
		fs.rmSync(target);
		fs.mkdirSync(target);
		fs.writeFileSync(path.join(target, 'blocker'), 'x');
		await expect(disk.put(key, Buffer.from('new copy'), 'image/jpeg')).rejects.toThrow();
		expect(fs.readdirSync(path.dirname(target)).some((f) => f.startsWith('.tmp-'))).toBe(false);
	});
});
