import { error, fail, type RequestEvent } from '@sveltejs/kit';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { acceptSchema, declineSchema } from '$lib/schemas/proposal';
import { statusOf } from '$lib/server/api/errors';
import { PaymentServiceError } from '$lib/server/payments';
import { DomainError, Invalid } from '$lib/server/services/errors';
import { answerProposal, openProposal, startDeposit } from '$lib/server/services/proposals';
import type { Actions, PageServerLoad } from './$types';

/**
 * The customer's page: no account, reached by the private link alone (a PUBLIC row in
 * $lib/roles). The link is the key, so it is kept out of referrers, caches and search engines.
 * Set in the load only: after an action the same request runs the load, and a header may be
 * set once.
 */
function privateHeaders(event: RequestEvent) {
	event.setHeaders({
		'cache-control': 'private, no-store',
		'referrer-policy': 'no-referrer',
		'x-robots-tag': 'noindex, nofollow'
	});
}

export const load: PageServerLoad = async (event) => {
	privateHeaders(event);
	try {
		const p = await openProposal(event.params.token);
		const notice = event.url.searchParams.get('deposit');
		return {
			proposal: p,
			notice: notice === 'paid' || notice === 'cancelled' ? notice : null
		};
	} catch (e) {
		if (e instanceof DomainError) error(statusOf(e), e.message);
		throw e;
	}
};

function refusal(e: unknown) {
	if (e instanceof Invalid) {
		const errors = Object.fromEntries((e.issues ?? []).map((i) => [i.path, i.message]));
		return fail(400, { message: e.message, errors });
	}
	if (e instanceof DomainError) return fail(statusOf(e), { message: e.message });
	if (e instanceof PaymentServiceError) return fail(502, { message: e.message });
	throw e;
}

export const actions: Actions = {
	accept: async (event) => {
		const fd = await event.request.formData();
		const values = formObject(fd);
		// Only the codes of the ticked extras are read; any price field in the body is ignored.
		const parsed = acceptSchema.safeParse({
			...values,
			extras: fd.getAll('extras').filter((v) => typeof v === 'string')
		});
		if (!parsed.success) {
			return fail(400, {
				values: { fullName: values.fullName ?? '' },
				errors: fieldErrors(parsed.error)
			});
		}
		try {
			await answerProposal(
				event.params.token,
				{ decision: 'accepted', fullName: parsed.data.fullName, extras: parsed.data.extras },
				{
					ipAddress: event.getClientAddress(),
					userAgent: event.request.headers.get('user-agent')
				}
			);
			return { done: 'Thank you: your acceptance is recorded.' };
		} catch (e) {
			return refusal(e);
		}
	},
	decline: async (event) => {
		const parsed = declineSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success) return fail(400, { errors: fieldErrors(parsed.error) });
		try {
			await answerProposal(
				event.params.token,
				{ decision: 'declined', reason: parsed.data.reason },
				{
					ipAddress: event.getClientAddress(),
					userAgent: event.request.headers.get('user-agent')
				}
			);
			return { done: 'Thank you for letting us know. Your answer is recorded.' };
		} catch (e) {
			return refusal(e);
		}
	},
	/**
	 * Starts the deposit payment and answers the payment page's address; the page goes there
	 * (the site's form-action policy keeps form posts on this origin, so no cross-site redirect).
	 */
	pay: async (event) => {
		try {
			return { payUrl: await startDeposit(event.params.token, event.url.origin) };
		} catch (e) {
			return refusal(e);
		}
	}
};
