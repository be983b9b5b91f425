import { env } from '../env';
import type { PhotoLimits } from './process';

export { checkPhotoBytes, PHOTO_TYPES, type PhotoType } from './check';
export { readPhotoExif, type PhotoExif, type PhotoPosition } from './exif';
export {
	processPhoto,
	DISPLAY_SIDE,
	THUMBNAIL_SIDE,
	type PhotoLimits,
	type ProcessedPhoto,
	type Rendition
} from './process';
export { PhotoRefusal, displayName, type PhotoRefusalReason } from './refusal';
export { checkRoomForPhotos, deletePhoto, storePhoto, type StoredPhoto } from './store';

/** The limits from the environment (CLEARPITCH_PHOTO_MAX_MB, CLEARPITCH_PHOTO_MAX_MEGAPIXELS). */
export function photoLimits(): PhotoLimits {
	return { maxBytes: env.photoMaxBytes, maxPixels: env.photoMaxPixels };
}
