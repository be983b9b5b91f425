import { requireRole } from '$lib/server/auth/guard';
import { listSites } from '$lib/server/services/sites';
import type { PageServerLoad } from './$types';

/** The list itself is fetched by the browser from /api/estimates; this only fills the filters. */
export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const sites = await listSites(user.companyId);
	return { sites: sites.map((s) => ({ id: s.id, address: s.address })) };
};
