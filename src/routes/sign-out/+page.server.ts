import { redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth/guard';
import { endSession } from '$lib/server/auth/session';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => redirect(303, '/');

export const actions: Actions = {
	default: async (event) => {
		requireUser(event);
		await endSession(event.cookies, event.locals.sessionId ?? undefined);
		redirect(303, '/sign-in');
	}
};
