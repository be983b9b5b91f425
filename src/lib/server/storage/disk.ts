import { randomUUID } from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import { assertKey } from './keys';
import type { Storage, StoredFile } from './types';

/**
 * Files on local disk. A put writes a temporary file in the same directory and renames it over
 * the target (rename is atomic within one file system), so a crash leaves the old file or the
 * new one, never half of one. The content type sits in a small side file written first.
 */
export class DiskStorage implements Storage {
	readonly kind = 'disk' as const;
	constructor(readonly root: string) {}

	private file(key: string): string {
		assertKey(key);
		return path.join(this.root, ...key.split('/'));
	}

	async put(key: string, bytes: Uint8Array, contentType: string): Promise<void> {
		const target = this.file(key);
		await fs.mkdir(path.dirname(target), { recursive: true });
		await writeAtomic(`${target}.type`, Buffer.from(contentType, 'utf8'));
		await writeAtomic(target, bytes);
	}

	async get(key: string): Promise<StoredFile | null> {
		const target = this.file(key);
		try {
			const bytes = await fs.readFile(target);
			const contentType = await fs
				.readFile(`${target}.type`, 'utf8')
				.catch(() => 'application/octet-stream');
			return { bytes, contentType, size: bytes.length };
		} catch (e) {
			if ((e as NodeJS.ErrnoException).code === 'ENOENT') return null;
			throw e;
		}
	}

	async delete(key: string): Promise<void> {
		const target = this.file(key);
		// The data first: once it is gone the key no longer exists, whatever happens next.
		await fs.rm(target, { force: true });
		await fs.rm(`${target}.type`, { force: true });
	}

	async exists(key: string): Promise<boolean> {
		try {
			return (await fs.stat(this.file(key))).isFile();
		} catch (e) {
			if ((e as NodeJS.ErrnoException).code === 'ENOENT') return false;
			throw e;
		}
	}
}

async function writeAtomic(target: string, bytes: Uint8Array): Promise<void> {
	const tmp = path.join(path.dirname(target), `.tmp-${randomUUID()}`);
	try {
		const handle = await fs.open(tmp, 'wx');
		try {
			await handle.writeFile(bytes);
			await handle.sync();
		} finally {
			await handle.close();
		}
		await fs.rename(tmp, target);
	} catch (e) {
		await fs.rm(tmp, { force: true });
		throw e;
	}
}
