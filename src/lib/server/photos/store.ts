import { newKey, type Storage } from '../storage';
import type { ProcessedPhoto } from './process';
import { PhotoRefusal } from './refusal';

export type StoredPhoto = { displayKey: string; thumbnailKey: string };

/** Refuses the files of a batch that would take a visit past its photo limit, all at once. */
export function checkRoomForPhotos(existing: number, names: string[], perVisit: number): void {
	const room = Math.max(0, perVisit - existing);
	if (names.length > room) {
		throw new PhotoRefusal(
			names[room],
			'too-many-photos',
			`a site visit holds at most ${perVisit} photos; it has ${existing}, so ${room} more fit and ${names.length} were sent.`
		);
	}
}

/**
 * Stores both copies of a processed photo under fresh server-made keys. If the second write
 * fails the first is removed again, so a photo is stored whole or not at all.
 */
export async function storePhoto(
	storage: Storage,
	companyId: string,
	photo: ProcessedPhoto
): Promise<StoredPhoto> {
	const displayKey = newKey('photos', companyId);
	const thumbnailKey = `${displayKey}-thumb`;
	await storage.put(displayKey, photo.display.bytes, photo.display.contentType);
	try {
		await storage.put(thumbnailKey, photo.thumbnail.bytes, photo.thumbnail.contentType);
	} catch (e) {
		await storage.delete(displayKey).catch(() => {});
		throw e;
	}
	return { displayKey, thumbnailKey };
}

/**
 * Removes both copies (the row that named them goes in the same request).
 * @public Used by the site-visit photo routes when a photo is removed.
 */
export async function deletePhoto(storage: Storage, stored: StoredPhoto): Promise<void> {
	await storage.delete(stored.displayKey);
	await storage.delete(stored.thumbnailKey);
}
