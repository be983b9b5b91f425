import { error, fail } from '@sveltejs/kit';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { doneSchema } from '$lib/schemas/job';
import { checklistItems } from '$lib/jobs/checklist';
import { planPicture } from '$lib/jobs/plan-picture';
import { dwellLimitMinutes, hazards, sheetFacets } from '$lib/jobs/sheet';
import { statusOf } from '$lib/server/api/errors';
import { requireRole } from '$lib/server/auth/guard';
import { DomainError, NotFound } from '$lib/server/services/errors';
import { getSheet, markDone } from '$lib/server/services/jobs';
import { listAfterPhotos } from '$lib/server/services/job-photos';
import { env } from '$lib/server/env';
import { photoLimits } from '$lib/server/photos';
import { companyImagery } from '$lib/server/services/sites';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'crew');
	let sheet;
	try {
		sheet = await getSheet(user, event.params.id);
	} catch (e) {
		if (e instanceof NotFound) error(404, 'No such crew sheet, or you are not on this job.');
		throw e;
	}
	const { input, result } = sheet;
	const facets = sheetFacets(result);
	const byId = new Map(result.facets.map((f) => [f.id, f]));
	return {
		job: sheet.job,
		crew: sheet.crew,
		site: sheet.site,
		imagery: await companyImagery(user.companyId),
		facets,
		picture: planPicture(
			input.facets.map((f) => ({
				id: f.id,
				geometry: f.geometry,
				edges: f.edges,
				access: f.access,
				growth: f.growth,
				ladderPlacements: byId.get(f.id)?.ladderPlacements ?? 0
			}))
		),
		chemistry: result.chemistry,
		hazards: hazards(result),
		expectations: result.expectations,
		checklist: checklistItems(facets),
		log: sheet.log,
		afterPhotos: sheet.afterPhotos,
		photos: await listAfterPhotos(user.companyId, event.params.id),
		photoRules: { maxBytes: photoLimits().maxBytes, perJob: env.photosPerVisit },
		dwellMinutes: dwellLimitMinutes(result.chemistry),
		labourHours: result.labour.hours,
		crewSize: result.labour.crewSize
	};
};

export const actions: Actions = {
	done: async (event) => {
		const user = requireRole(event, 'owner', 'crew');
		const parsed = doneSchema.safeParse(formObject(await event.request.formData()));
		if (!parsed.success) return fail(400, { errors: fieldErrors(parsed.error) });
		try {
			await markDone(user, event.params.id, parsed.data.reason, event.url.origin);
			return {
				done: 'Marked done. Thank you — the office has it, and the customer has the final invoice.'
			};
		} catch (e) {
			if (e instanceof DomainError) return fail(statusOf(e), { message: e.message });
			throw e;
		}
	}
};
