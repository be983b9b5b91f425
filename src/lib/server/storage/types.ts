/** One place every uploaded file goes through; keys are made by the server, never by users. */
export interface Storage {
	readonly kind: 'disk' | 's3';
	/** Stores the whole file or nothing: a reader never sees half of it. */
	put(key: string, bytes: Uint8Array, contentType: string): Promise<void>;
	/** The file, or null when there is none under this key. */
	get(key: string): Promise<StoredFile | null>;
	/** Removes the file; removing a missing key is not an error. */
	delete(key: string): Promise<void>;
	exists(key: string): Promise<boolean>;
}

export type StoredFile = { bytes: Buffer; contentType: string; size: number };

/** A key the storage refuses (never a user's file name, never a path out of the store). */
export class StorageKeyError extends Error {
	override name = 'StorageKeyError';
}
