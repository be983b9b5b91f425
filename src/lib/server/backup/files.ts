import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import fs from 'node:fs/promises';
import path from 'node:path';
import { assertKey } from '../storage/keys';
import type { FileEntry } from './manifest';

/** SHA-256 and size of a file on disk, read as a stream (photos can be large). */
export async function digestFile(file: string): Promise<{ size: number; sha256: string }> {
	const hash = createHash('sha256');
	let size = 0;
	for await (const chunk of createReadStream(file)) {
		hash.update(chunk as Buffer);
		size += (chunk as Buffer).length;
	}
	return { size, sha256: hash.digest('hex') };
}

/**
 * Every stored file of the disk store under `root`, by key. The store's own side files (`.type`)
 * and half-written temporary files (`.tmp-…`) are not files of their own, so they are skipped;
 * the content type travels in the manifest instead.
 */
export async function listStoredFiles(root: string): Promise<FileEntry[]> {
	const out: FileEntry[] = [];
	async function walk(dir: string, prefix: string[]): Promise<void> {
		let names: import('node:fs').Dirent[];
		try {
			names = await fs.readdir(dir, { withFileTypes: true });
		} catch (e) {
			if ((e as NodeJS.ErrnoException).code === 'ENOENT') return;
			throw e;
		}
		for (const d of names.sort((a, b) => a.name.localeCompare(b.name))) {
			if (d.name.startsWith('.') || d.name.endsWith('.type')) continue;
			const full = path.join(dir, d.name);
			if (d.isDirectory()) await walk(full, [...prefix, d.name]);
			else if (d.isFile()) {
				const key = [...prefix, d.name].join('/');
				// A stray file the store could not have made is not part of the data.
				try {
					assertKey(key);
				} catch {
					continue;
				}
				const contentType = await fs
					.readFile(`${full}.type`, 'utf8')
					.catch(() => 'application/octet-stream');
				out.push({ key, contentType, ...(await digestFile(full)) });
			}
		}
	}
	await walk(root, []);
	return out;
}

/** The disk path of a key under `root`; the key was checked against the storage rule first. */
export function fileOf(root: string, key: string): string {
	assertKey(key);
	return path.join(root, ...key.split('/'));
}
