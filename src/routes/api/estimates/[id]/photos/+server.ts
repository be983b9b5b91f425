import { json } from '@sveltejs/kit';
import { ApiError, answer, zodInvalid } from '$lib/server/api/errors';
import { photoRefusalResponse, readPhotoBody } from '$lib/server/api/photo-upload';
import { photoNameSchema } from '$lib/schemas/site-visit';
import { requireRole } from '$lib/server/auth/guard';
import { PhotoRefusal, photoLimits } from '$lib/server/photos';
import { addVisitPhoto, listEstimatePhotos } from '$lib/server/services/visit-photos';
import type { RequestHandler } from './$types';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The photos of the estimate's site visit, oldest first. */
export const GET: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const id = event.params.id;
		if (!UUID.test(id)) throw new ApiError(404, `No estimate with id ${id}.`);
		return json({ photos: await listEstimatePhotos(user.companyId, id) });
	});

/**
 * One photo per request, its bytes as the body and its name in X-Photo-Name (percent-encoded):
 * the page sends each file on its own, so each has its own progress bar and its own answer.
 */
export const POST: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const id = event.params.id;
		if (!UUID.test(id)) throw new ApiError(404, `No estimate with id ${id}.`);
		const name = photoNameSchema.safeParse(event.request.headers.get('x-photo-name') ?? undefined);
		if (!name.success) throw zodInvalid(name.error, 'upload');
		try {
			const bytes = await readPhotoBody(event.request, name.data, photoLimits().maxBytes);
			const photo = await addVisitPhoto(user, id, { name: name.data, bytes });
			return json({ photo }, { status: 201 });
		} catch (e) {
			if (e instanceof PhotoRefusal) return photoRefusalResponse(e);
			throw e;
		}
	});
