import { json } from '@sveltejs/kit';
import { ApiError, answer } from '$lib/server/api/errors';
import { requireRole } from '$lib/server/auth/guard';
import { getJob } from '$lib/server/services/jobs';
import type { RequestHandler } from './$types';

/** One job: its plan, history and the crew's log. Crew see only the jobs they are on. */
export const GET: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'sales', 'crew');
		const job = await getJob(user, event.params.id);
		if (!job) throw new ApiError(404, `No job with id ${event.params.id}.`);
		return json(job);
	});
