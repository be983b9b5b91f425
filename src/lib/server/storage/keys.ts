import { randomUUID } from 'node:crypto';
import { StorageKeyError } from './types';

// Segments of letters, digits, '-' and '_' only: no dots (so no '..' and no clash with the
// disk store's '.type' side files), no user file names, nothing a path or URL treats specially.
const SEGMENT = /^[A-Za-z0-9_-]{1,100}$/;

/** Throws unless `key` is one the server could have made. */
export function assertKey(key: string): void {
	const parts = typeof key === 'string' ? key.split('/') : [];
	if (parts.length === 0 || parts.length > 8 || !parts.every((p) => SEGMENT.test(p))) {
		throw new StorageKeyError(`Not a storage key: ${JSON.stringify(key)}`);
	}
}

/** A fresh key under a prefix, e.g. newKey('photos', companyId) → "photos/<company>/<uuid>". */
export function newKey(...prefix: string[]): string {
	const key = [...prefix, randomUUID()].join('/');
	assertKey(key);
	return key;
}
