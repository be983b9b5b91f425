import { requireRole } from '$lib/server/auth/guard';
import { listSites } from '$lib/server/services/sites';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const q = event.url.searchParams.get('q') ?? '';
	return { sites: await listSites(user.companyId, q), q };
};
