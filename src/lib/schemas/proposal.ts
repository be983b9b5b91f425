import { z } from 'zod';
import { NUL_MESSAGE, noNul } from './form';

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

function isRealDate(s: string): boolean {
	const m = ISO_DATE.exec(s);
	if (!m) return false;
	const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
	return d.toISOString().slice(0, 10) === s;
}

const addDays = (today: string, n: number) =>
	new Date(Date.parse(`${today}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

/** Longest a proposal may stay open; prices and roofs both change. */
export const MAX_VALIDITY_DAYS = 180;
export const DEFAULT_VALIDITY_DAYS = 30;

export function defaultValidUntil(now = new Date()): string {
	return addDays(now.toISOString().slice(0, 10), DEFAULT_VALIDITY_DAYS);
}

/** Sending a proposal: to whom, and until when it holds (a day after today at the earliest). */
export function sendProposalSchema(now = new Date()) {
	const today = now.toISOString().slice(0, 10);
	const last = addDays(today, MAX_VALIDITY_DAYS);
	return z.object({
		to: z
			.string({ error: 'Enter the customer’s e-mail address, like name@example.com.' })
			.trim()
			.max(254, 'An e-mail address has at most 254 characters.')
			.pipe(z.email('Enter the customer’s e-mail address, like name@example.com.')),
		validUntil: z
			.string({ error: 'Enter a date as YYYY-MM-DD.' })
			.trim()
			.refine(isRealDate, 'Enter a date as YYYY-MM-DD.')
			.refine((d) => d > today, 'The proposal must be good until a day after today at least.')
			.refine((d) => d <= last, `A proposal may be good for ${MAX_VALIDITY_DAYS} days at most.`)
	});
}

export const proposalIdSchema = z.object({
	proposalId: z.uuid('Choose a proposal version from the list.')
});

export const mailIdSchema = z.object({ mailId: z.uuid('Choose a message from the list.') });

const EXTRA_CODE = /^[a-z_]{1,40}$/;

/** The customer's acceptance. Only extra codes are read: their prices come from the server. */
export const acceptSchema = z.object({
	fullName: z
		.string({ error: 'Type your full name to sign.' })
		.trim()
		.min(2, 'Type your full name to sign.')
		.max(120, 'A name has at most 120 characters.')
		.refine(noNul, NUL_MESSAGE)
		.refine((s) => /\p{L}/u.test(s), 'Type your full name to sign.'),
	consent: z.literal('yes', {
		error: 'Tick the box to agree to the scope, price and terms.'
	}),
	extras: z
		.array(z.string().regex(EXTRA_CODE, 'Choose extras from the list.'))
		.max(10, 'Choose extras from the list.')
		.default([])
});

export const declineSchema = z.object({
	/** The decline button's own value: a body without it is not a decline. */
	decision: z.literal('declined', { error: 'Press Decline to decline.' }),
	reason: z
		.string({ error: 'Write the reason as text.' })
		.trim()
		.max(1000, 'Keep the reason to 1000 characters.')
		.refine(noNul, NUL_MESSAGE)
		.default('')
});
