import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { getSite } from '$lib/server/services/sites';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const row = await getSite(user.companyId, event.params.id);
	if (!row) error(404, 'No such site.');
	const { site, customer } = row;
	return {
		site: {
			id: site.id,
			address: site.address,
			lat: site.lat,
			lon: site.lon,
			notes: site.notes,
			gateCode: site.gateCode,
			pets: site.pets,
			waterSource: site.waterSource,
			flags: site.flags
		},
		customer: { name: customer.name, email: customer.email, phone: customer.phone }
	};
};
