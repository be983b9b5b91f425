import { json } from '@sveltejs/kit';
import { ApiError, answer, zodInvalid } from '$lib/server/api/errors';
import { photoRefusalResponse, readPhotoBody } from '$lib/server/api/photo-upload';
import { photoNameSchema } from '$lib/schemas/site-visit';
import { requireRole } from '$lib/server/auth/guard';
import { PhotoRefusal, photoLimits } from '$lib/server/photos';
import { addAfterPhoto, listAfterPhotos } from '$lib/server/services/job-photos';
import { getJob } from '$lib/server/services/jobs';
import type { RequestHandler } from './$types';

/** A job's after photos, oldest first; crew reach only the jobs they are on (404 otherwise). */
export const GET: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'crew');
		if (!(await getJob(user, event.params.id))) {
			throw new ApiError(404, `No job with id ${event.params.id}.`);
		}
		return json({ photos: await listAfterPhotos(user.companyId, event.params.id) });
	});

/**
 * One after photo per request, as for site-visit photos: its bytes as the body and its name in
 * X-Photo-Name (percent-encoded), so each file has its own progress bar and its own answer.
 */
export const POST: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'crew');
		if (!(await getJob(user, event.params.id))) {
			throw new ApiError(404, `No job with id ${event.params.id}.`);
		}
		const name = photoNameSchema.safeParse(event.request.headers.get('x-photo-name') ?? undefined);
		if (!name.success) throw zodInvalid(name.error, 'upload');
		try {
			const bytes = await readPhotoBody(event.request, name.data, photoLimits().maxBytes);
			const photo = await addAfterPhoto(user, event.params.id, { name: name.data, bytes });
			return json({ photo }, { status: 201 });
		} catch (e) {
			if (e instanceof PhotoRefusal) return photoRefusalResponse(e);
			throw e;
		}
	});
