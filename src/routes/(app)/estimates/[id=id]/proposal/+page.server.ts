import { error, fail } from '@sveltejs/kit';
import { fieldErrors, formObject } from '$lib/schemas/form';
import {
	defaultValidUntil,
	mailIdSchema,
	proposalIdSchema,
	sendProposalSchema
} from '$lib/schemas/proposal';
import { statusOf } from '$lib/server/api/errors';
import { requireRole } from '$lib/server/auth/guard';
import { getDb } from '$lib/server/db';
import { getMailTransport, retryMailNow, sendQueuedMail } from '$lib/server/mail';
import { DomainError } from '$lib/server/services/errors';
import { proposalsOf, revokeProposal, sendProposal } from '$lib/server/services/proposals';
import type { Actions, PageServerLoad } from './$types';

const MAIL_STATE: Record<string, string> = {
	sent: 'The e-mail went out.',
	failed: 'The e-mail could not be delivered yet; it is retried automatically (see below).',
	dead: 'The mail server refused the e-mail; check the address and retry (see below).'
};

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'estimator', 'sales');
	try {
		const data = await proposalsOf(user.companyId, event.params.id, {
			validUntil: defaultValidUntil(),
			salesperson: user.name
		});
		return {
			...data,
			canSend: user.role === 'owner' || user.role === 'sales',
			defaults: { to: data.customerEmail ?? '', validUntil: defaultValidUntil() }
		};
	} catch (e) {
		if (e instanceof DomainError) error(statusOf(e), e.message);
		throw e;
	}
};

export const actions: Actions = {
	send: async (event) => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const values = formObject(await event.request.formData());
		const parsed = sendProposalSchema().safeParse(values);
		if (!parsed.success) {
			return fail(400, {
				values: { to: values.to ?? '', validUntil: values.validUntil ?? '' },
				errors: fieldErrors(parsed.error)
			});
		}
		try {
			const r = await sendProposal(user, event.params.id, parsed.data, event.url.origin);
			if (!r.created) {
				return { done: `Version ${r.version} is already with the customer; nothing new was sent.` };
			}
			return {
				done: `Version ${r.version} sent to ${parsed.data.to}. ${MAIL_STATE[r.mailStatus ?? ''] ?? ''}`.trim()
			};
		} catch (e) {
			if (e instanceof DomainError) return fail(statusOf(e), { message: e.message });
			throw e;
		}
	},
	revoke: async (event) => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const parsed = proposalIdSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success) return fail(400, { message: parsed.error.issues[0].message });
		try {
			await revokeProposal(user, event.params.id, parsed.data.proposalId);
			return { done: 'The link was withdrawn; the customer now sees that it is no longer valid.' };
		} catch (e) {
			if (e instanceof DomainError) return fail(statusOf(e), { message: e.message });
			throw e;
		}
	},
	retryMail: async (event) => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const parsed = mailIdSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success) return fail(400, { message: parsed.error.issues[0].message });
		const db = await getDb();
		if (!(await retryMailNow(db, user.companyId, parsed.data.mailId))) {
			return fail(409, { message: 'That message is not waiting for a retry.' });
		}
		const status = await sendQueuedMail(db, getMailTransport(), parsed.data.mailId);
		return { done: MAIL_STATE[status ?? ''] ?? 'The e-mail is queued again.' };
	}
};
