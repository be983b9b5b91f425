import { json } from '@sveltejs/kit';
import { planIssues, savePlanSchema, summariseIssues } from '$lib/schemas/roof-plan';
import { readJson } from '$lib/server/api/body';
import { answer, ApiError } from '$lib/server/api/errors';
import { requireRole } from '$lib/server/auth/guard';
import { savePlan } from '$lib/server/services/roof-plans';
import type { RequestHandler } from './$types';

/** adapter-node's default body limit; a 30-facet plan is about 20 KB. */
const MAX_PLAN_BYTES = 512 * 1024;

/** Saves a roof plan as its site's next version. A refused body writes nothing. */
export const POST: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const body = await readJson(event.request, MAX_PLAN_BYTES);
		const parsed = savePlanSchema.safeParse(body);
		if (!parsed.success) {
			const issues = planIssues(parsed.error, body);
			throw new ApiError(400, summariseIssues(issues), issues);
		}
		const r = await savePlan(user.companyId, user.id, parsed.data);
		if (r.ok) {
			return json(
				{ plan: r.plan },
				{ status: 201, headers: { location: `/api/roof-plans/${r.plan.id}` } }
			);
		}
		if (r.reason === 'no_site') {
			throw new ApiError(404, 'No such site.', [{ path: 'siteId', message: 'no such site' }]);
		}
		if (r.reason === 'bad_based_on') {
			const message = `basedOnVersion must name an existing version (the latest is ${r.latestVersion ?? 'none'})`;
			throw new ApiError(400, `The roof plan was not saved: ${message}.`, [
				{ path: 'basedOnVersion', message }
			]);
		}
		return json(
			{
				message:
					r.latestVersion === null
						? 'The roof plan was not saved: this site has no plan yet, so baseVersion must be null.'
						: `The roof plan was not saved: version ${r.latestVersion} was saved since you started editing. Open it, or save again to put yours on top.`,
				latestVersion: r.latestVersion,
				issues: [{ path: 'baseVersion', message: 'a newer version exists' }]
			},
			{ status: 409 }
		);
	});
