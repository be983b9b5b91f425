import { error, fail } from '@sveltejs/kit';
import { fieldErrors } from '$lib/schemas/form';
import {
	formWithLists,
	photoDeleteSchema,
	photoToggleSchema,
	testSpotFormSchema,
	visitFacetSchema,
	visitSiteSchema
} from '$lib/schemas/site-visit';
import { statusOf } from '$lib/server/api/errors';
import { requireRole } from '$lib/server/auth/guard';
import { env } from '$lib/server/env';
import { photoLimits } from '$lib/server/photos';
import { DomainError } from '$lib/server/services/errors';
import { getEstimate } from '$lib/server/services/estimates';
import { getPlanById } from '$lib/server/services/roof-plans';
import {
	confirmVisit,
	getVisit,
	saveTestSpot,
	saveVisitFacet,
	saveVisitSite,
	startVisit
} from '$lib/server/services/site-visits';
import { companyImagery, getSiteDetail } from '$lib/server/services/sites';
import {
	listVisitPhotos,
	removeVisitPhoto,
	setPhotoForProposal
} from '$lib/server/services/visit-photos';
import { money } from '$lib/components/estimate/format';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

const OFFICE = ['owner', 'estimator', 'sales'] as const;

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, ...OFFICE);
	const estimate = await getEstimate(user.companyId, event.params.id);
	if (!estimate) error(404, 'No such estimate.');
	const [visit, site, imagery] = await Promise.all([
		getVisit(user.companyId, estimate.id),
		estimate.siteId ? getSiteDetail(user.companyId, estimate.siteId) : null,
		companyImagery(user.companyId)
	]);
	const plan =
		!visit && estimate.roofPlanId ? await getPlanById(user.companyId, estimate.roofPlanId) : null;
	const photos = visit ? await listVisitPhotos(user.companyId, visit.id) : [];
	const limits = photoLimits();
	return {
		estimate: {
			id: estimate.id,
			status: estimate.status,
			address: estimate.site?.address ?? null,
			customerName: estimate.site?.customerName ?? null,
			price: {
				totalCents: estimate.result.price.totalCents,
				lowCents: estimate.result.price.lowCents,
				highCents: estimate.result.price.highCents,
				measuredOnSite: estimate.result.price.measuredOnSite
			}
		},
		site: site && { lat: site.lat, lon: site.lon },
		imagery,
		// Before the visit starts: what it will start from.
		preview: visit
			? null
			: {
					version: plan?.version ?? null,
					facets: plan?.facets ?? []
				},
		visit,
		photos,
		photoRules: { maxBytes: limits.maxBytes, perVisit: env.photosPerVisit }
	};
};

type Form = Record<string, string | string[]>;

/** Runs a service call and answers its domain refusals as the form's message. */
async function attempt<T>(form: string, values: Form, run: () => Promise<T>) {
	try {
		return { ok: true as const, value: await run() };
	} catch (e) {
		if (e instanceof DomainError) {
			const errors: Record<string, string> = {};
			for (const i of e.issues ?? []) errors[i.path || '_'] ??= i.message;
			return {
				ok: false as const,
				fail: fail(statusOf(e), { form, values, errors, message: e.message })
			};
		}
		throw e;
	}
}

async function read(event: RequestEvent, lists: string[] = []) {
	return formWithLists(await event.request.formData(), lists);
}

export const actions: Actions = {
	start: async (event) => {
		const user = requireRole(event, ...OFFICE);
		const r = await attempt('start', {}, () => startVisit(user, event.params.id));
		if (!r.ok) return r.fail;
		return { form: 'start', done: 'Site visit started.' };
	},

	facet: async (event) => {
		const user = requireRole(event, ...OFFICE);
		const values = await read(event);
		const parsed = visitFacetSchema.safeParse(values);
		if (!parsed.success) {
			return fail(400, { form: 'facet', values, errors: fieldErrors(parsed.error) });
		}
		const r = await attempt('facet', values, () =>
			saveVisitFacet(user, event.params.id, parsed.data)
		);
		if (!r.ok) return r.fail;
		return { form: 'facet', facetId: parsed.data.facetId, done: 'Facet saved.' };
	},

	site: async (event) => {
		const user = requireRole(event, ...OFFICE);
		const values = await read(event, ['obstacles']);
		const parsed = visitSiteSchema.safeParse(values);
		if (!parsed.success) {
			return fail(400, { form: 'site', values, errors: fieldErrors(parsed.error) });
		}
		const r = await attempt('site', values, () =>
			saveVisitSite(user, event.params.id, parsed.data)
		);
		if (!r.ok) return r.fail;
		return { form: 'site', done: 'Site notes saved.' };
	},

	testSpot: async (event) => {
		const user = requireRole(event, ...OFFICE);
		const values = await read(event, ['facetIds']);
		const parsed = testSpotFormSchema.safeParse(values);
		if (!parsed.success) {
			return fail(400, { form: 'testSpot', values, errors: fieldErrors(parsed.error) });
		}
		const r = await attempt('testSpot', values, () =>
			saveTestSpot(user, event.params.id, parsed.data)
		);
		if (!r.ok) return r.fail;
		return { form: 'testSpot', done: 'Test spot saved.' };
	},

	confirm: async (event) => {
		const user = requireRole(event, ...OFFICE);
		const r = await attempt('confirm', {}, () => confirmVisit(user, event.params.id));
		if (!r.ok) return r.fail;
		const o = r.value;
		return {
			form: 'confirm',
			done: o.confirmed
				? `Visit confirmed: roof plan v${o.planVersion} saved; the estimate is ready at ${money(o.after.totalCents)} (range ${money(o.after.lowCents)} – ${money(o.after.highCents)}).`
				: 'This visit was already confirmed.'
		};
	},

	photo: async (event) => {
		const user = requireRole(event, ...OFFICE);
		const values = await read(event);
		const parsed = photoToggleSchema.safeParse(values);
		if (!parsed.success) {
			return fail(400, { form: 'photo', values, errors: fieldErrors(parsed.error) });
		}
		const { photoId, forProposal } = parsed.data;
		const r = await attempt('photo', values, () =>
			setPhotoForProposal(user, event.params.id, photoId, forProposal)
		);
		if (!r.ok) return r.fail;
		return {
			form: 'photo',
			done: forProposal
				? 'The photo will show on the proposal.'
				: 'The photo is kept off the proposal.'
		};
	},

	deletePhoto: async (event) => {
		const user = requireRole(event, ...OFFICE);
		const values = await read(event);
		const parsed = photoDeleteSchema.safeParse(values);
		if (!parsed.success) {
			return fail(400, { form: 'deletePhoto', values, errors: fieldErrors(parsed.error) });
		}
		const r = await attempt('deletePhoto', values, () =>
			removeVisitPhoto(user, event.params.id, parsed.data.photoId)
		);
		if (!r.ok) return r.fail;
		return { form: 'deletePhoto', done: 'Photo deleted.' };
	}
};
