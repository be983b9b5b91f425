import { fail } from '@sveltejs/kit';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { companyContactSchema, imagerySchema } from '$lib/schemas/settings';
import { requireRole } from '$lib/server/auth/guard';
import { getCompany, setContact, setImagery } from '$lib/server/services/company';
import { Conflict } from '$lib/server/services/errors';
import {
	calibrateGrowth,
	growthCalibrationView,
	resetGrowthCalibration
} from '$lib/server/services/growth-calibration';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner');
	const [c, growth] = await Promise.all([
		getCompany(user.companyId),
		growthCalibrationView(user.companyId)
	]);
	return {
		growth,
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
	},
	// Refusals are 400 with the reason, as a form's refusal is: the request cannot be carried out
	// on the data there is (too few site-visit facets, nothing to reset).
	calibrate: async (event) => {
		const user = requireRole(event, 'owner');
		try {
			const c = await calibrateGrowth(user.companyId, user.id);
			return {
				growth: {
					done:
						`Calibrated on ${c.samples} site-visit facets: the suggestion matches the site grade ` +
						`on ${c.exactBefore} of ${c.samples} before and ${c.exactAfter} of ${c.samples} now; ` +
						`off by ${c.errorBefore} → ${c.errorAfter} grade steps in all.`
				}
			};
		} catch (e) {
			if (e instanceof Conflict) return fail(400, { growth: { error: e.message } });
			throw e;
		}
	},
	resetCalibration: async (event) => {
		const user = requireRole(event, 'owner');
		try {
			await resetGrowthCalibration(user.companyId, user.id);
		} catch (e) {
			if (e instanceof Conflict) return fail(400, { growth: { error: e.message } });
			throw e;
		}
		return { growth: { done: 'Growth suggestions use the default cuts again.' } };
	}
};
