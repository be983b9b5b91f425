import { json } from '@sveltejs/kit';
import { readJson } from '$lib/server/api/body';
import { answer, zodInvalid } from '$lib/server/api/errors';
import { jobLogSchema } from '$lib/schemas/job';
import { requireRole } from '$lib/server/auth/guard';
import { saveLog } from '$lib/server/services/jobs';
import type { RequestHandler } from './$types';

/**
 * The crew sheet sends its log here, at once when online and later from the device's queue.
 * `stored: false` means a newer change from another device is already kept.
 */
export const PUT: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'crew');
		const parsed = jobLogSchema.safeParse(await readJson(event.request, 64 * 1024));
		if (!parsed.success) throw zodInvalid(parsed.error, 'log');
		return json(await saveLog(user, event.params.id, parsed.data));
	});
