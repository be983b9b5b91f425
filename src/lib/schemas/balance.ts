import { z } from 'zod';
import { noNul, NUL_MESSAGE } from './form';

/** The owner's record of a balance paid outside the card path. The amount is the invoice's own. */
export const recordPaymentSchema = z.object({
	method: z.enum(['cash', 'cheque'], { error: 'Pick cash or cheque.' }),
	reference: z
		.string()
		.default('')
		.transform((s) => s.trim())
		.refine(noNul, NUL_MESSAGE)
		.refine((s) => s.length <= 80, 'Keep the reference to 80 characters.')
});

/** Dollars as typed ("50", "$1,250.5"): whole cents, more than zero, at most $1,000,000. */
const dollars = z
	.string({ error: 'Enter the amount to credit, e.g. 50.00' })
	.transform((s) => s.trim().replace(/^\$/, '').replaceAll(',', ''))
	.refine(
		(s) => /^\d{1,7}(\.\d{1,2})?$/.test(s),
		'Enter an amount in dollars and cents, e.g. 50.00'
	)
	.transform((s) => Math.round(Number(s) * 100))
	.refine((c) => c > 0, 'A credit must be more than $0.00.');

/** The owner's credit note against a final invoice: what it takes off, and why. */
export const creditNoteSchema = z.object({
	amount: dollars,
	reason: z
		.string({ error: 'Say what the credit is for.' })
		.transform((s) => s.trim())
		.refine(noNul, NUL_MESSAGE)
		.refine((s) => s.length >= 3, 'Say what the credit is for (at least 3 characters).')
		.refine((s) => s.length <= 120, 'Keep the reason to 120 characters.')
});
