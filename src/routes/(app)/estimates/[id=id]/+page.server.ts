import { error, fail } from '@sveltejs/kit';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { creditNoteSchema, recordPaymentSchema } from '$lib/schemas/balance';
import { balanceOf, creditBalance, recordPayment } from '$lib/server/services/balance';
import { statusOf } from '$lib/server/api/errors';
import { DomainError } from '$lib/server/services/errors';
import { estimatePatchSchema } from '$lib/schemas/estimates-api';
import { requireRole } from '$lib/server/auth/guard';
import { nextStatusesFor } from '$lib/estimate-status';
import { changeStatus, getEstimate } from '$lib/server/services/estimates';
import { proposalsOf } from '$lib/server/services/proposals';
import { defaultValidUntil } from '$lib/schemas/proposal';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	const estimate = await getEstimate(user.companyId, event.params.id);
	if (!estimate) error(404, 'No such estimate.');
	// An estimate without a site has no customer, so no proposal.
	const proposal = estimate.site
		? await proposalsOf(user.companyId, estimate.id, {
				validUntil: defaultValidUntil(),
				salesperson: user.name
			})
		: null;
	return {
		estimate,
		nextStatuses: nextStatusesFor(estimate.status, user.role),
		proposals: proposal?.versions ?? null,
		balance: await balanceOf(user.companyId, estimate.id),
		canRecordPayment: user.role === 'owner'
	};
};

export const actions: Actions = {
	status: async (event) => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const parsed = estimatePatchSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success) return fail(400, { message: parsed.error.issues[0].message });
		try {
			const moved = await changeStatus(user, event.params.id, parsed.data.status);
			return { done: `Marked ${moved.status}.` };
		} catch (e) {
			if (e instanceof DomainError) return fail(statusOf(e), { message: e.message });
			throw e;
		}
	},
	payment: async (event) => {
		const user = requireRole(event, 'owner');
		const parsed = recordPaymentSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success) return fail(400, { paymentErrors: fieldErrors(parsed.error) });
		try {
			const b = await recordPayment(user, event.params.id, parsed.data);
			return { done: `Invoice ${b.number} recorded as paid.` };
		} catch (e) {
			if (e instanceof DomainError) return fail(statusOf(e), { paymentMessage: e.message });
			throw e;
		}
	},
	credit: async (event) => {
		const user = requireRole(event, 'owner');
		const parsed = creditNoteSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success) return fail(400, { creditErrors: fieldErrors(parsed.error) });
		try {
			const b = await creditBalance(user, event.params.id, {
				reason: parsed.data.reason,
				amountCents: parsed.data.amount
			});
			const note = b.credits[b.credits.length - 1];
			return { done: `Credit note ${note.number} issued against invoice ${b.number}.` };
		} catch (e) {
			if (e instanceof DomainError) return fail(statusOf(e), { creditMessage: e.message });
			throw e;
		}
	}
};
