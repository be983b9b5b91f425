import { requireRole } from '$lib/server/auth/guard';
import { queryObject } from '$lib/schemas/list-query';
import { latestPlanSummaries } from '$lib/server/services/roof-plans';
import { companyImagery, listSitesPage } from '$lib/server/services/sites';
import { SITE_PAGE_SIZE, siteListQuerySchema } from '$lib/schemas/site-list';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const params = queryObject(event.url.searchParams);
	const q = (params.q ?? '').slice(0, 200);
	// A hand-edited page number falls back to the first page rather than an error page.
	const parsed = siteListQuerySchema.safeParse({ q, page: params.page });
	const page = parsed.success ? parsed.data.page : 1;
	const [list, imagery] = await Promise.all([
		listSitesPage(user.companyId, { q, page, pageSize: SITE_PAGE_SIZE }),
		companyImagery(user.companyId)
	]);
	const plans = await latestPlanSummaries(
		user.companyId,
		list.items.map((s) => s.id)
	);
	return {
		sites: list.items.map((s) => {
			const p = plans.get(s.id);
			return { ...s, plan: p ? { version: p.version, squares: p.squares } : null };
		}),
		total: list.total,
		page: list.page,
		pageCount: Math.max(1, Math.ceil(list.total / list.pageSize)),
		pageSize: list.pageSize,
		q,
		imagery
	};
};
