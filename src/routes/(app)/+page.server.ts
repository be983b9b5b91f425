import { requireUser } from '$lib/server/auth/guard';
import { todaySummary } from '$lib/server/services/today';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	return { summary: await todaySummary(user.companyId) };
};
