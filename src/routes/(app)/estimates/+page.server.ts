import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { listEstimates } from '$lib/server/services/estimates';
import { getSite } from '$lib/server/services/sites';
import {
	ESTIMATES_PAGE_SIZE,
	estimateListSearch,
	readEstimateListFilters
} from '$lib/schemas/estimate-list-filters';
import type { PageServerLoad } from './$types';

/** The list comes from the address bar, so a reload, a shared link or no JavaScript show the same rows. */
export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const { filters, ignored } = readEstimateListFilters(event.url.searchParams);
	const { page, site, ...rest } = filters;
	// Only the site filtered on is read: a company may have thousands, and the text box finds
	// estimates by address without a list of them all.
	const [siteRow, list] = await Promise.all([
		site ? getSite(user.companyId, site) : undefined,
		listEstimates(user.companyId, {
			...rest,
			siteId: site,
			page,
			pageSize: ESTIMATES_PAGE_SIZE
		})
	]);
	// A page past the end (an old link, or rows gone since): go to the last page instead.
	if (list.items.length === 0 && list.total > 0 && page > 1) {
		const last = Math.ceil(list.total / ESTIMATES_PAGE_SIZE);
		redirect(303, `/estimates${estimateListSearch(filters, last)}`);
	}
	return {
		site: siteRow ? { id: siteRow.site.id, address: siteRow.site.address } : null,
		filters,
		ignored,
		list: {
			...list,
			items: list.items.map((e) => ({
				id: e.id,
				status: e.status,
				address: e.address,
				customerName: e.customerName,
				totalCents: e.totalCents,
				squares: e.squares,
				rateCardVersion: e.rateCardVersion,
				createdAt: e.createdAt.toISOString()
			}))
		}
	};
};
