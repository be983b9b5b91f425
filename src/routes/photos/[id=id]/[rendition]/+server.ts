import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { readPhotoFile } from '$lib/server/services/visit-photos';
import { PHOTO_RENDITIONS, type PhotoRendition } from '$lib/types/site-visit';
import type { RequestHandler } from './$types';

/**
 * A site-visit photo, to signed-in members of its company only; another company's id is a 404
 * like an unknown one. The stored copies carry no EXIF (photos/process.ts), so neither does this.
 */
export const GET: RequestHandler = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales', 'crew');
	const rendition = event.params.rendition;
	if (!(PHOTO_RENDITIONS as readonly string[]).includes(rendition)) error(404, 'No such photo.');
	const file = await readPhotoFile(user.companyId, event.params.id, rendition as PhotoRendition);
	if (!file) error(404, 'No such photo.');
	return new Response(file.bytes as Uint8Array<ArrayBuffer>, {
		headers: {
			'content-type': 'image/jpeg',
			'content-length': String(file.size),
			// A photo never changes under its id; it is private to the signed-in browser.
			'cache-control': 'private, max-age=86400',
			'x-content-type-options': 'nosniff',
			'content-disposition': 'inline'
		}
	});
};
