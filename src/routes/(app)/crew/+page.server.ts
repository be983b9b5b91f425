import { requireRole } from '$lib/server/auth/guard';
import { addDays, localToday } from '$lib/jobs/week';
import { listCrew, listSheets } from '$lib/server/services/jobs';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'crew');
	const today = localToday();
	// Open jobs whatever their date, and the last week's done ones for reference.
	const [jobs, crew] = await Promise.all([
		listSheets(user, addDays(today, -7)),
		listCrew(user.companyId)
	]);
	return { today, jobs, crew, mine: user.role === 'crew' };
};
