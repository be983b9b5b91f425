import sharp, { type SharpOptions } from 'sharp';
import { checkPhotoBytes, type PhotoType } from './check';
import { readPhotoExif, type PhotoExif } from './exif';
import { PhotoRefusal } from './refusal';

export type PhotoLimits = { maxBytes: number; maxPixels: number };
export type Rendition = { bytes: Buffer; contentType: 'image/jpeg'; width: number; height: number };

export type ProcessedPhoto = PhotoExif & {
	/** The user's name for the file, for messages and captions only; never a storage key. */
	name: string;
	/** The type found in the bytes, whatever the name said. */
	type: PhotoType;
	width: number;
	height: number;
	/** A re-encoded copy (long side ≤ 2048 px) with every metadata tag stripped. */
	display: Rendition;
	/** A small copy (long side ≤ 320 px), stripped the same way. */
	thumbnail: Rendition;
};

const DISPLAY_SIDE = 2048;
const THUMBNAIL_SIDE = 320;

/**
 * Checks one uploaded photo and makes what Clearpitch keeps of it: position and time read from
 * the original, and two JPEG copies without EXIF (sharp drops metadata unless asked to keep it),
 * turned upright first so dropping the orientation tag does not turn them on their side.
 * Throws PhotoRefusal naming the file for anything it will not take.
 */
export async function processPhoto(
	upload: { name: string; bytes: Uint8Array },
	limits: PhotoLimits
): Promise<ProcessedPhoto> {
	const { name, bytes } = upload;
	const type = await checkPhotoBytes(name, bytes, limits.maxBytes);
	const input = { limitInputPixels: limits.maxPixels, failOn: 'error' as const };

	let width: number;
	let height: number;
	try {
		// The header alone: a bomb is refused before a single pixel is decoded.
		const meta = await sharp(bytes, { ...input, limitInputPixels: false }).metadata();
		width = meta.autoOrient?.width ?? meta.width;
		height = meta.autoOrient?.height ?? meta.height;
	} catch {
		throw unreadable(name, type);
	}
	if (!width || !height) throw unreadable(name, type);
	if (width * height > limits.maxPixels) {
		throw new PhotoRefusal(
			name,
			'too-many-pixels',
			`the image claims ${width} × ${height} pixels; the limit is ${(limits.maxPixels / 1e6).toFixed(0)} megapixels.`
		);
	}

	const exif = await readPhotoExif(bytes);
	try {
		const [display, thumbnail] = await Promise.all([
			render(bytes, input, DISPLAY_SIDE, 82),
			render(bytes, input, THUMBNAIL_SIDE, 75)
		]);
		return { name, type, width, height, ...exif, display, thumbnail };
	} catch (e) {
		if (e instanceof Error && /pixel limit/i.test(e.message)) {
			throw new PhotoRefusal(name, 'too-many-pixels', 'the image has more pixels than allowed.');
		}
		throw unreadable(name, type);
	}
}

async function render(
	bytes: Uint8Array,
	input: SharpOptions,
	side: number,
	quality: number
): Promise<Rendition> {
	const { data, info } = await sharp(bytes, input)
		.rotate()
		.resize({ width: side, height: side, fit: 'inside', withoutEnlargement: true })
		.flatten({ background: '#ffffff' })
		.jpeg({ quality, mozjpeg: true })
		.toBuffer({ resolveWithObject: true });
	return { bytes: data, contentType: 'image/jpeg', width: info.width, height: info.height };
}

function unreadable(name: string, type: PhotoType): PhotoRefusal {
	return new PhotoRefusal(
		name,
		'unreadable',
		type === 'image/heic' || type === 'image/heif'
			? 'this HEIC photo cannot be read here; set the camera to save JPEG ("most compatible") or send a JPEG copy.'
			: 'the file looks like a photo but is damaged or cut short.'
	);
}
