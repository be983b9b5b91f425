import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { getPlan, listVersions } from '$lib/server/services/roof-plans';
import { companyImagery, getSiteDetail } from '$lib/server/services/sites';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const site = await getSiteDetail(user.companyId, event.params.id);
	if (!site) error(404, 'No such site.');
	const [plan, versions, imagery] = await Promise.all([
		getPlan(user.companyId, site.id),
		listVersions(user.companyId, site.id),
		companyImagery(user.companyId)
	]);
	const { customer, ...rest } = site;
	return {
		site: rest,
		customer,
		imagery,
		plan: plan && {
			version: plan.version,
			source: plan.source,
			createdAt: plan.createdAt,
			createdBy: plan.createdBy,
			facets: plan.facets,
			measures: plan.measures,
			totals: plan.totals
		},
		versionCount: versions.length
	};
};
