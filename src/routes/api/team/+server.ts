import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { listTeam } from '$lib/server/services/team';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const user = requireRole(event, 'owner');
	return json({ members: await listTeam(user.companyId) });
};
