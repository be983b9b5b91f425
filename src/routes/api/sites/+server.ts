import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { listSites } from '$lib/server/services/sites';
import type { RequestHandler } from './$types';

/** Sites with their positions, for maps and integrations; `?q=` searches address and customer. */
export const GET: RequestHandler = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const q = (event.url.searchParams.get('q') ?? '').slice(0, 200);
	return json({ sites: await listSites(user.companyId, q) });
};
