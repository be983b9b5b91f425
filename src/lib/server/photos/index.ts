import { env } from '../env';
import type { PhotoLimits } from './process';

// The module's API for the site-visit photo routes that come next; `@public` keeps knip from
// reporting what only those routes will use.

export {
	/** @public The upload form's accepted types, used by the site-visit photo routes. */
	PHOTO_TYPES,
	/** @public Used by the site-visit photo routes. */
	type PhotoType
} from './check';
export {
	/** @public Part of a processed photo, used by the site-visit photo routes. */
	type PhotoExif,
	/** @public Part of a processed photo, used by the site-visit photo routes. */
	type PhotoPosition
} from './exif';
export {
	processPhoto,
	/** @public Used by the site-visit photo routes. */
	type PhotoLimits,
	type ProcessedPhoto,
	/** @public Part of a processed photo, used by the site-visit photo routes. */
	type Rendition
} from './process';
export {
	PhotoRefusal,
	/** @public The routes map a refusal's reason to its 4xx status. */
	type PhotoRefusalReason
} from './refusal';
export { photoDto, photoFields } from './rows';
export {
	checkRoomForPhotos,
	/** @public Used by the site-visit photo routes when a photo is removed. */
	deletePhoto,
	storePhoto,
	/** @public Used by the site-visit photo routes. */
	type StoredPhoto
} from './store';

/**
 * The limits from the environment (CLEARPITCH_PHOTO_MAX_MB, CLEARPITCH_PHOTO_MAX_MEGAPIXELS).
 * @public Used by the site-visit photo routes.
 */
export function photoLimits(): PhotoLimits {
	return { maxBytes: env.photoMaxBytes, maxPixels: env.photoMaxPixels };
}
