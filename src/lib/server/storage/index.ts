import { env } from '../env';
import { DiskStorage } from './disk';
import { S3Storage } from './s3';
import type { Storage } from './types';

export { DiskStorage } from './disk';
export { S3Storage } from './s3';
export { newKey } from './keys';
export {
	StorageKeyError,
	type Storage,
	/** @public What `Storage.get` answers, read by the site-visit photo routes. */
	type StoredFile
} from './types';

let storage: Storage | undefined;

/**
 * The configured store: the S3 bucket when CLEARPITCH_S3_BUCKET is set, else local disk.
 * @public Used by the site-visit photo routes.
 */
export function getStorage(): Storage {
	if (!storage) {
		const s3 = env.s3;
		storage = s3 ? new S3Storage(s3) : new DiskStorage(env.filesDir);
	}
	return storage;
}
