import { requireUser } from '$lib/server/auth/guard';
import { todaySummary } from '$lib/server/services/today';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	// Crew see jobs, not the office's pipeline.
	return { summary: user.role === 'crew' ? null : await todaySummary(user.companyId) };
};
