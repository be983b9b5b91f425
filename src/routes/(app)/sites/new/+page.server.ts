import { fail, redirect } from '@sveltejs/kit';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { siteSchema } from '$lib/schemas/site';
import { requireRole } from '$lib/server/auth/guard';
import { companyImagery, createSite } from '$lib/server/services/sites';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const imagery = await companyImagery(user.companyId);
	const b = imagery.bounds;
	// Start where the imagery is; with a world-wide source, the middle of the demo town.
	const center: [number, number] = b ? [(b[0] + b[2]) / 2, (b[1] + b[3]) / 2] : [-74.46, 35.52];
	return { imagery, center };
};

export const actions: Actions = {
	default: async (event) => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const values = formObject(await event.request.formData());
		const parsed = siteSchema.safeParse(values);
		if (!parsed.success) return fail(400, { values, errors: fieldErrors(parsed.error) });
		const id = await createSite(user.companyId, parsed.data);
		redirect(303, `/sites/${id}`);
	}
};
