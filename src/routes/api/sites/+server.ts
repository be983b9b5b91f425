import { json } from '@sveltejs/kit';
import { answer, zodInvalid } from '$lib/server/api/errors';
import { queryObject } from '$lib/schemas/list-query';
import { requireRole } from '$lib/server/auth/guard';
import { listSitesPage } from '$lib/server/services/sites';
import { siteListQuerySchema } from '$lib/schemas/site-list';
import type { RequestHandler } from './$types';

/**
 * One page of sites with their positions, for maps and integrations: `?q=` searches address and
 * customer, `?page=` and `?pageSize=` (at most 100) page through them; `total` counts the matches.
 */
export const GET: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const parsed = siteListQuerySchema.safeParse(queryObject(event.url.searchParams));
		if (!parsed.success) throw zodInvalid(parsed.error, 'query');
		const { items, ...paging } = await listSitesPage(user.companyId, parsed.data);
		return json({ sites: items, ...paging });
	});
