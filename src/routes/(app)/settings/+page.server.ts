import { fail } from '@sveltejs/kit';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { companyContactSchema, imagerySchema } from '$lib/schemas/settings';
import { requireRole } from '$lib/server/auth/guard';
import { getCompany, setContact, setImagery } from '$lib/server/services/company';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner');
	const c = await getCompany(user.companyId);
	return {
		template: c?.imageryUrlTemplate ?? '',
		attribution: c?.imageryAttribution ?? '',
		contact: {
			phone: c?.phone ?? '',
			email: c?.email ?? '',
			postalAddress: c?.postalAddress ?? '',
			licence: c?.licence ?? ''
		}
	};
};

export const actions: Actions = {
	imagery: async (event) => {
		const user = requireRole(event, 'owner');
		const values = formObject(await event.request.formData());
		const parsed = imagerySchema.safeParse(values);
		if (!parsed.success) return fail(400, { values, errors: fieldErrors(parsed.error) });
		await setImagery(user.companyId, parsed.data.template, parsed.data.attribution, user.id);
		return { done: parsed.data.template ? 'Imagery source saved.' : 'Using the sample imagery.' };
	},
	contact: async (event) => {
		const user = requireRole(event, 'owner');
		const values = formObject(await event.request.formData());
		const parsed = companyContactSchema.safeParse(values);
		if (!parsed.success) {
			return fail(400, { contact: { values, errors: fieldErrors(parsed.error) } });
		}
		await setContact(user.companyId, parsed.data, user.id);
		return { contact: { done: 'Saved. Proposals sent from now on carry these details.' } };
	}
};
