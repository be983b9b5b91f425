import { z } from 'zod';

/** The crew hours a done job took, recorded by the owner from the crew's time sheet. */
export const jobHoursSchema = z.object({
	jobId: z.uuid('Pick a job from the list.'),
	hours: z
		.string({ error: 'Enter the hours.' })
		.trim()
		.min(1, 'Enter the hours.')
		.transform((v) => Number(v))
		.refine(Number.isFinite, 'Enter the hours as a number, e.g. 3.5.')
		.refine((n) => n > 0, 'Hours must be above 0.')
		.refine((n) => n <= 200, 'Hours must be at most 200 for one job.')
});
