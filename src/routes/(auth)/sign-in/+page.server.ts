import { fail, redirect } from '@sveltejs/kit';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { signInSchema } from '$lib/schemas/auth';
import { signInLimited } from '$lib/server/auth/rate-limit';
import { startSession } from '$lib/server/auth/session';
import { checkCredentials } from '$lib/server/services/team';
import type { Actions, PageServerLoad } from './$types';

const WRONG = 'That e-mail and password do not match an active account.';

function safeNext(next: string | null): string {
	return next && next.startsWith('/') && !next.startsWith('//') ? next : '/';
}

export const load: PageServerLoad = ({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next')));
	return {};
};

export const actions: Actions = {
	default: async (event) => {
		const values = formObject(await event.request.formData());
		const emailValue = values.email ?? '';
		if (await signInLimited(event, emailValue)) {
			return fail(429, {
				email: emailValue,
				message: 'Too many sign-in attempts. Wait a minute and try again.'
			});
		}
		const parsed = signInSchema.safeParse(values);
		if (!parsed.success) {
			return fail(400, { email: emailValue, errors: fieldErrors(parsed.error), message: null });
		}
		const user = await checkCredentials(parsed.data.email, parsed.data.password);
		if (!user) return fail(400, { email: emailValue, message: WRONG });
		await startSession(event.cookies, user.id, user.companyId);
		redirect(303, safeNext(event.url.searchParams.get('next')));
	}
};
