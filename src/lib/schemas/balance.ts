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
