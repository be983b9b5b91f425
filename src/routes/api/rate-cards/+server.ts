import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { rateCardHistory } from '$lib/server/services/rate-cards';
import type { RequestHandler } from './$types';

/** Every version with its figures, newest first; the owner edits them on the Rates page. */
export const GET: RequestHandler = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	return json({ items: await rateCardHistory(user.companyId) });
};
