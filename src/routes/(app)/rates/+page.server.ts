import { fail, redirect } from '@sveltejs/kit';
import { PREVIEW_ROOFS } from '$lib/rates/preview-roofs';
import { noNul, NUL_MESSAGE, formObject } from '$lib/schemas/form';
import { requireRole } from '$lib/server/auth/guard';
import { rateCardHistory, saveRateCard } from '$lib/server/services/rate-cards';
import { diffCards, formToCard } from './card-form';
import type { Actions, PageServerLoad } from './$types';

const MAX_NOTE = 200;

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner');
	const history = await rateCardHistory(user.companyId);
	const current = history[0];
	return {
		current: current ? { id: current.id, version: current.version, card: current.card } : null,
		history: history.map((v, i) => ({
			id: v.id,
			version: v.version,
			isDefault: v.isDefault,
			note: v.note,
			createdBy: v.createdBy,
			createdAt: v.createdAt,
			changes: history[i + 1] ? diffCards(history[i + 1].card, v.card) : []
		})),
		roofs: PREVIEW_ROOFS,
		saved: Number(event.url.searchParams.get('saved')) || null
	};
};

export const actions: Actions = {
	save: async (event) => {
		const user = requireRole(event, 'owner');
		const { note: rawNote = '', ...values } = formObject(await event.request.formData());
		const note = rawNote.trim();
		if (note.length > MAX_NOTE) {
			return fail(400, { values, note, errors: { note: `At most ${MAX_NOTE} characters` } });
		}
		if (!noNul(note)) return fail(400, { values, note, errors: { note: NUL_MESSAGE } });
		const parsed = formToCard(values);
		if (!parsed.ok) return fail(400, { values, note, errors: parsed.errors });
		const [latest] = await rateCardHistory(user.companyId);
		if (latest && diffCards(latest.card, parsed.card).length === 0) {
			return fail(400, {
				values,
				note,
				errors: { _: 'Nothing has changed since version ' + latest.version + '.' }
			});
		}
		const saved = await saveRateCard(user.companyId, user.id, parsed.card, note);
		redirect(303, `/rates?saved=${saved.version}`);
	}
};
