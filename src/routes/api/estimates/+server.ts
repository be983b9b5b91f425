import { json } from '@sveltejs/kit';
import { estimateRequestSchema } from '$lib/schemas/estimate';
import { readJson } from '$lib/server/api/body';
import { answer, zodInvalid } from '$lib/server/api/errors';
import { jsonResponse } from '$lib/server/api/respond';
import { estimateListQuerySchema, queryObject } from '$lib/server/api/schemas';
import { requireRole } from '$lib/server/auth/guard';
import { listEstimates, priceEstimate } from '$lib/server/services/estimates';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const parsed = estimateRequestSchema.safeParse(await readJson(event.request));
		if (!parsed.success) throw zodInvalid(parsed.error);
		const priced = await priceEstimate(user, parsed.data);
		return jsonResponse(priced, priced.estimate ? 201 : 200);
	});

export const GET: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const parsed = estimateListQuerySchema.safeParse(queryObject(event.url.searchParams));
		if (!parsed.success) throw zodInvalid(parsed.error, 'query');
		const { site, ...rest } = parsed.data;
		return json(await listEstimates(user.companyId, { ...rest, siteId: site }));
	});
