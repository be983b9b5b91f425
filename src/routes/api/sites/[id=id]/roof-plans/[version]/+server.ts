import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { getPlan, siteExists } from '$lib/server/services/roof-plans';
import type { RequestHandler } from './$types';

/** One version of the site's roof plan by number, or `latest`. */
export const GET: RequestHandler = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const raw = event.params.version;
	const version = raw === 'latest' ? undefined : /^[1-9]\d{0,8}$/.test(raw) ? Number(raw) : NaN;
	if (Number.isNaN(version)) {
		return json(
			{ message: 'The version must be a whole number from 1, or "latest".' },
			{ status: 400 }
		);
	}
	if (!(await siteExists(user.companyId, event.params.id))) {
		return json({ message: 'No such site.' }, { status: 404 });
	}
	const plan = await getPlan(user.companyId, event.params.id, version);
	if (!plan) {
		return json(
			{
				message: version
					? `This site has no roof plan version ${version}.`
					: 'This site has no roof plan yet.'
			},
			{ status: 404 }
		);
	}
	return json({ plan });
};
