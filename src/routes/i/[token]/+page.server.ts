import { error, fail } from '@sveltejs/kit';
import { statusOf } from '$lib/server/api/errors';
import { PaymentServiceError } from '$lib/server/payments';
import { customerInvoice, startBalancePayment } from '$lib/server/services/balance';
import { DomainError } from '$lib/server/services/errors';
import type { Actions, PageServerLoad } from './$types';

/**
 * The customer's final invoice: no account, reached by the private link in its e-mail alone (a
 * PUBLIC row in $lib/roles). The link is the key, so it stays out of referrers, caches and search
 * engines.
 */
export const load: PageServerLoad = async (event) => {
	event.setHeaders({
		'cache-control': 'private, no-store',
		'referrer-policy': 'no-referrer',
		'x-robots-tag': 'noindex, nofollow'
	});
	try {
		const invoice = await customerInvoice(event.params.token);
		const notice = event.url.searchParams.get('payment');
		return {
			invoice,
			notice: notice === 'paid' || notice === 'cancelled' ? notice : null
		};
	} catch (e) {
		if (e instanceof DomainError) error(statusOf(e), e.message);
		throw e;
	}
};

export const actions: Actions = {
	/**
	 * Starts the card payment of the balance and answers the payment page's address; the page
	 * goes there (the form-action policy keeps form posts on this origin).
	 */
	pay: async (event) => {
		try {
			return { payUrl: await startBalancePayment(event.params.token, event.url.origin) };
		} catch (e) {
			if (e instanceof DomainError) return fail(statusOf(e), { message: e.message });
			if (e instanceof PaymentServiceError) return fail(502, { message: e.message });
			throw e;
		}
	}
};
