import { fileTypeFromBuffer } from 'file-type';
import { PhotoRefusal } from './refusal';

/** What a site-visit photo may be, by its bytes. HEIC passes here; sharp must still read it. */
export const PHOTO_TYPES = {
	'image/jpeg': 'JPEG',
	'image/png': 'PNG',
	'image/webp': 'WebP',
	'image/heic': 'HEIC',
	'image/heif': 'HEIF'
} as const;
export type PhotoType = keyof typeof PHOTO_TYPES;

/**
 * Checks the size, then the real type from the file's first bytes. The name and the type the
 * browser claims are never trusted: a page saved as "roof.jpg" is refused.
 */
export async function checkPhotoBytes(
	name: string,
	bytes: Uint8Array,
	maxBytes: number
): Promise<PhotoType> {
	if (bytes.byteLength === 0) throw new PhotoRefusal(name, 'empty', 'the file is empty.');
	if (bytes.byteLength > maxBytes) {
		throw new PhotoRefusal(
			name,
			'too-large',
			`the file is ${mb(bytes.byteLength)}; photos may be at most ${mb(maxBytes)} each.`
		);
	}
	const found = await fileTypeFromBuffer(bytes);
	if (!found) {
		throw new PhotoRefusal(
			name,
			'not-an-image',
			'the file is not a photo (JPEG, PNG, WebP or HEIC).'
		);
	}
	if (!(found.mime in PHOTO_TYPES)) {
		throw new PhotoRefusal(
			name,
			'type-not-allowed',
			`the file is ${found.ext.toUpperCase()} (${found.mime}); photos must be JPEG, PNG, WebP or HEIC.`
		);
	}
	return found.mime as PhotoType;
}

function mb(n: number): string {
	return `${(n / (1024 * 1024)).toFixed(1).replace(/\.0$/, '')} MB`;
}
