import type { PhotoDto } from '../../types/site-visit';
import type { photos } from '../db/schema';
import type { ProcessedPhoto } from './process';
import type { StoredPhoto } from './store';

type PhotoRow = typeof photos.$inferSelect;

/** A stored photo as the screens and the API show it (site-visit and after photos alike). */
export function photoDto(r: PhotoRow): PhotoDto {
	return {
		id: r.id,
		fileName: r.fileName,
		width: r.width,
		height: r.height,
		lat: r.lat,
		lon: r.lon,
		takenAt: r.takenAt,
		forProposal: r.forProposal,
		createdAt: r.createdAt.toISOString()
	};
}

/** The columns of a photo row that come from its processing and its stored copies. */
export function photoFields(processed: ProcessedPhoto, stored: StoredPhoto) {
	return {
		displayKey: stored.displayKey,
		thumbnailKey: stored.thumbnailKey,
		fileName: processed.name,
		width: processed.width,
		height: processed.height,
		lat: processed.position?.lat ?? null,
		lon: processed.position?.lon ?? null,
		takenAt: processed.takenAt,
		takenAtOffset: processed.takenAtOffset
	};
}
