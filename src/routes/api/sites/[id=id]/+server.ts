import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { getSiteDetail } from '$lib/server/services/sites';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const site = await getSiteDetail(user.companyId, event.params.id);
	if (!site) return json({ message: 'No such site.' }, { status: 404 });
	return json({ site });
};
