import { fail, redirect } from '@sveltejs/kit';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { siteSchema } from '$lib/schemas/site';
import { requireRole } from '$lib/server/auth/guard';
import { createSite } from '$lib/server/services/sites';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = (event) => {
	requireRole(event, 'owner', 'estimator', 'sales');
	return {};
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
