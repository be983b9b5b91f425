import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { getPlan, listVersions } from '$lib/server/services/roof-plans';
import { companyImagery, getSiteDetail } from '$lib/server/services/sites';
import { companyGrowthThresholds } from '$lib/server/services/growth-calibration';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	// The editor refreshes its version list after a save with invalidate('app:roof-plan').
	event.depends('app:roof-plan');
	const site = await getSiteDetail(user.companyId, event.params.id);
	if (!site) error(404, 'No such site.');
	const asked = event.url.searchParams.get('version');
	if (asked !== null && !/^[1-9]\d{0,8}$/.test(asked)) {
		error(400, 'The version must be a whole number from 1.');
	}
	const [versions, imagery, growthThresholds] = await Promise.all([
		listVersions(user.companyId, site.id),
		companyImagery(user.companyId),
		companyGrowthThresholds(user.companyId)
	]);
	const plan = await getPlan(user.companyId, site.id, asked ? Number(asked) : undefined);
	if (asked && !plan) error(404, `This site has no roof plan version ${asked}.`);
	const latest = versions[0]?.version ?? null;
	return {
		site: { id: site.id, address: site.address, lat: site.lat, lon: site.lon },
		imagery,
		plan: plan && {
			id: plan.id,
			version: plan.version,
			source: plan.source,
			note: plan.note,
			facets: plan.facets
		},
		versions,
		growthThresholds,
		readOnly: !!plan && plan.version !== latest
	};
};
