import { requireRole } from '$lib/server/auth/guard';
import { latestPlanSummaries } from '$lib/server/services/roof-plans';
import { companyImagery, listSites } from '$lib/server/services/sites';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const q = (event.url.searchParams.get('q') ?? '').slice(0, 200);
	const [sites, plans, imagery] = await Promise.all([
		listSites(user.companyId, q),
		latestPlanSummaries(user.companyId),
		companyImagery(user.companyId)
	]);
	return {
		sites: sites.map((s) => {
			const p = plans.get(s.id);
			return { ...s, plan: p ? { version: p.version, squares: p.squares } : null };
		}),
		q,
		imagery
	};
};
