import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { listVersions, siteExists } from '$lib/server/services/roof-plans';
import type { RequestHandler } from './$types';

/** Every saved version of the site's roof plan, newest first. */
export const GET: RequestHandler = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	if (!(await siteExists(user.companyId, event.params.id))) {
		return json({ message: 'No such site.' }, { status: 404 });
	}
	return json({ versions: await listVersions(user.companyId, event.params.id) });
};
