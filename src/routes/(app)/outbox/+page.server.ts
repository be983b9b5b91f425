import { error, fail } from '@sveltejs/kit';
import { formObject } from '$lib/schemas/form';
import { mailIdSchema } from '$lib/schemas/proposal';
import { requireRole } from '$lib/server/auth/guard';
import { getDb } from '$lib/server/db';
import { env } from '$lib/server/env';
import {
	getMailTransport,
	listOutbox,
	readFakeInbox,
	retryMailNow,
	sendQueuedMail
} from '$lib/server/mail';
import type { Actions, PageServerLoad } from './$types';

function demoOnly() {
	if (!env.mailFakeInboxUrl) {
		error(404, 'The Outbox is shown in demo mode only, beside the local mail server.');
	}
}

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner');
	demoOnly();
	const db = await getDb();
	const rows = await listOutbox(db, user.companyId);
	let inbox: Awaited<ReturnType<typeof readFakeInbox>> = [];
	let inboxError: string | null = null;
	try {
		inbox = await readFakeInbox();
	} catch (e) {
		inboxError = (e as Error).message;
	}
	return {
		outbox: rows.map((r) => ({
			id: r.id,
			to: r.toAddress,
			subject: r.subject,
			status: r.status,
			attempts: r.attempts,
			lastError: r.lastError,
			nextAttemptAt: r.nextAttemptAt,
			sentAt: r.sentAt,
			createdAt: r.createdAt,
			messageId: r.messageId
		})),
		inbox: (inbox ?? [])
			.slice()
			.reverse()
			.slice(0, 50)
			.map((m) => ({
				id: m.id,
				receivedAt: m.receivedAt,
				to: m.to.join(', '),
				subject: m.subject,
				text: m.text,
				messageId: m.messageId
			})),
		inboxError
	};
};

export const actions: Actions = {
	retry: async (event) => {
		const user = requireRole(event, 'owner');
		demoOnly();
		const parsed = mailIdSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success) return fail(400, { message: parsed.error.issues[0].message });
		const db = await getDb();
		if (!(await retryMailNow(db, user.companyId, parsed.data.mailId))) {
			return fail(409, { message: 'That message is not waiting for a retry.' });
		}
		const status = await sendQueuedMail(db, getMailTransport(), parsed.data.mailId);
		return { done: status === 'sent' ? 'Sent.' : `Tried again: ${status ?? 'queued'}.` };
	}
};
