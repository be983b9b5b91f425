import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { getPlanById } from '$lib/server/services/roof-plans';
import type { RequestHandler } from './$types';

/** One saved version of a roof plan, with its measurements. */
export const GET: RequestHandler = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const plan = await getPlanById(user.companyId, event.params.id);
	if (!plan) return json({ message: 'No such roof plan.' }, { status: 404 });
	return json({ plan });
};
