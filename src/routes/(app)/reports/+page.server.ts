import { fail } from '@sveltejs/kit';
import { crewHours } from '$lib/reports/aggregate';
import { reportTables } from '$lib/reports/tables';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { jobHoursSchema } from '$lib/schemas/report';
import { requireRole } from '$lib/server/auth/guard';
import { Conflict, NotFound } from '$lib/server/services/errors';
import { recordJobHours, reportFacts } from '$lib/server/services/reports';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner');
	const facts = await reportFacts(user.companyId);
	return {
		tables: reportTables(facts),
		doneJobs: crewHours(facts.jobs).rows
	};
};

export const actions: Actions = {
	hours: async (event) => {
		const user = requireRole(event, 'owner');
		const values = formObject(await event.request.formData());
		const parsed = jobHoursSchema.safeParse(values);
		if (!parsed.success) return fail(400, { hours: { values, errors: fieldErrors(parsed.error) } });
		try {
			await recordJobHours(user.companyId, user.id, parsed.data.jobId, parsed.data.hours);
		} catch (e) {
			if (e instanceof NotFound) {
				return fail(404, { hours: { values, errors: { jobId: 'No such job; reload the page.' } } });
			}
			if (e instanceof Conflict) {
				return fail(409, { hours: { values, errors: { jobId: e.message } } });
			}
			throw e;
		}
		return { hours: { done: `Recorded ${parsed.data.hours} h.` } };
	}
};
