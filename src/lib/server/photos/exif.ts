import exifr from 'exifr';

export type PhotoPosition = { lat: number; lon: number };
export type PhotoExif = {
	position: PhotoPosition | null;
	/** The camera's wall-clock time, "YYYY-MM-DDTHH:MM:SS", zone as the camera wrote it (often none). */
	takenAt: string | null;
	/** The camera's offset from UTC, e.g. "-04:00", when it wrote one. */
	takenAtOffset: string | null;
};

/**
 * Reads where and when a photo was taken, from the original before EXIF is stripped.
 * Broken or missing EXIF is normal (screenshots, edited copies) and gives nulls, never an error.
 */
export async function readPhotoExif(bytes: Uint8Array): Promise<PhotoExif> {
	let tags: Record<string, unknown> | undefined;
	try {
		tags = await exifr.parse(Buffer.from(bytes), {
			gps: true,
			exif: true,
			ifd0: {},
			tiff: true,
			reviveValues: true,
			pick: ['DateTimeOriginal', 'CreateDate', 'OffsetTimeOriginal', 'latitude', 'longitude']
		});
	} catch {
		tags = undefined;
	}
	if (!tags) return { position: null, takenAt: null, takenAtOffset: null };
	const lat = tags.latitude;
	const lon = tags.longitude;
	const position =
		typeof lat === 'number' &&
		typeof lon === 'number' &&
		Number.isFinite(lat) &&
		Number.isFinite(lon) &&
		Math.abs(lat) <= 90 &&
		Math.abs(lon) <= 180 &&
		!(lat === 0 && lon === 0)
			? { lat, lon }
			: null;
	const when = tags.DateTimeOriginal ?? tags.CreateDate;
	const offset = tags.OffsetTimeOriginal;
	return {
		position,
		takenAt: when instanceof Date && !Number.isNaN(when.getTime()) ? wallClock(when) : null,
		takenAtOffset: typeof offset === 'string' && /^[+-]\d\d:\d\d$/.test(offset) ? offset : null
	};
}

// exifr builds the Date from the zone-less EXIF text in this process's local zone; reading it
// back with the local getters gives the camera's own text again, whatever TZ the server has.
function wallClock(d: Date): string {
	const p = (n: number) => String(n).padStart(2, '0');
	return (
		`${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}` +
		`T${p(d.getHours())}:${p(d.getMinutes())}:${p(d.getSeconds())}`
	);
}
