import { fail } from '@sveltejs/kit';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { inviteSchema, setRoleSchema, tokenSchema, userIdSchema } from '$lib/schemas/auth';
import { requireRole } from '$lib/server/auth/guard';
import {
	TeamError,
	createToken,
	inviteUser,
	listTeam,
	listTokens,
	revokeToken,
	setActive,
	setRole
} from '$lib/server/services/team';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner');
	const [team, tokens] = await Promise.all([listTeam(user.companyId), listTokens(user.companyId)]);
	return { team, tokens, me: user.id };
};

function teamFail(e: unknown, action: string) {
	if (e instanceof TeamError) {
		return fail(400, {
			action,
			message: e.message,
			errors: e.field ? { [e.field]: e.message } : {}
		});
	}
	throw e;
}

export const actions: Actions = {
	invite: async (event) => {
		const user = requireRole(event, 'owner');
		const values = formObject(await event.request.formData());
		const parsed = inviteSchema.safeParse(values);
		if (!parsed.success) {
			const { password: _p, ...keep } = values;
			return fail(400, { action: 'invite', values: keep, errors: fieldErrors(parsed.error) });
		}
		try {
			await inviteUser(user.companyId, parsed.data, user.id);
		} catch (e) {
			return teamFail(e, 'invite');
		}
		return { action: 'invite', done: `${parsed.data.name} can now sign in.` };
	},
	role: async (event) => {
		const user = requireRole(event, 'owner');
		const parsed = setRoleSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success)
			return fail(400, { action: 'role', message: parsed.error.issues[0].message });
		try {
			await setRole(user.companyId, parsed.data.userId, parsed.data.role, user.id);
		} catch (e) {
			return teamFail(e, 'role');
		}
		return { action: 'role', done: 'Role updated.' };
	},
	deactivate: async (event) => {
		const user = requireRole(event, 'owner');
		const parsed = userIdSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success)
			return fail(400, { action: 'deactivate', message: parsed.error.issues[0].message });
		try {
			await setActive(user.companyId, parsed.data.userId, false, user.id);
		} catch (e) {
			return teamFail(e, 'deactivate');
		}
		return { action: 'deactivate', done: 'Deactivated; their sessions have ended.' };
	},
	reactivate: async (event) => {
		const user = requireRole(event, 'owner');
		const parsed = userIdSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success)
			return fail(400, { action: 'reactivate', message: parsed.error.issues[0].message });
		try {
			await setActive(user.companyId, parsed.data.userId, true, user.id);
		} catch (e) {
			return teamFail(e, 'reactivate');
		}
		return { action: 'reactivate', done: 'Reactivated.' };
	},
	token: async (event) => {
		const user = requireRole(event, 'owner');
		const parsed = tokenSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success) return fail(400, { action: 'token', errors: fieldErrors(parsed.error) });
		const token = await createToken(user.companyId, user.id, parsed.data.name);
		return { action: 'token', token, done: 'Token created. Copy it now: it is shown only once.' };
	},
	revoke: async (event) => {
		const user = requireRole(event, 'owner');
		const id = formObject(await event.request.formData()).tokenId ?? '';
		if (!/^[0-9a-f-]{36}$/i.test(id))
			return fail(400, { action: 'revoke', message: 'Unknown token.' });
		await revokeToken(user.companyId, id, user.id);
		return { action: 'revoke', done: 'Token revoked.' };
	}
};
