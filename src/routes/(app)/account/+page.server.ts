import { fail } from '@sveltejs/kit';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { changePasswordSchema } from '$lib/schemas/auth';
import { requireUser } from '$lib/server/auth/guard';
import { TeamError, changePassword } from '$lib/server/services/team';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = (event) => {
	requireUser(event);
	return {};
};

export const actions: Actions = {
	password: async (event) => {
		const user = requireUser(event);
		const parsed = changePasswordSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success) return fail(400, { errors: fieldErrors(parsed.error) });
		try {
			await changePassword(user.id, event.locals.sessionId, parsed.data.current, parsed.data.next);
		} catch (e) {
			if (e instanceof TeamError) return fail(400, { errors: { [e.field ?? '_']: e.message } });
			throw e;
		}
		return { done: 'Password changed. Your other sessions have been signed out.' };
	}
};
