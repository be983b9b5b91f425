import { json } from '@sveltejs/kit';
import { readJson } from '$lib/server/api/body';
import { ApiError, answer, zodInvalid } from '$lib/server/api/errors';
import { estimatePatchSchema } from '$lib/schemas/estimates-api';
import { requireRole } from '$lib/server/auth/guard';
import { nextStatusesFor } from '$lib/estimate-status';
import type { EstimateDetail } from '$lib/types/estimate';
import { changeStatus, getEstimate } from '$lib/server/services/estimates';
import type { RequestHandler } from './$types';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function withNext(e: EstimateDetail, role: App.Role) {
	return { ...e, nextStatuses: nextStatusesFor(e.status, role) };
}

export const GET: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const id = event.params.id;
		const found = UUID.test(id) ? await getEstimate(user.companyId, id) : undefined;
		if (!found) throw new ApiError(404, `No estimate with id ${id}.`);
		return json(withNext(found, user.role));
	});

export const PATCH: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const id = event.params.id;
		if (!UUID.test(id)) throw new ApiError(404, `No estimate with id ${id}.`);
		const parsed = estimatePatchSchema.safeParse(await readJson(event.request));
		if (!parsed.success) throw zodInvalid(parsed.error);
		return json(withNext(await changeStatus(user, id, parsed.data.status), user.role));
	});
