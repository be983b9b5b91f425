import { json } from '@sveltejs/kit';
import { readJsonBytes } from '$lib/server/api/body';
import { answer, zodInvalid } from '$lib/server/api/errors';
import { jsonBytesResponse, jsonResponse } from '$lib/server/api/respond';
import { estimateListQuerySchema } from '$lib/schemas/estimates-api';
import { queryObject } from '$lib/schemas/list-query';
import { requireRole } from '$lib/server/auth/guard';
import { listEstimates, priceEstimateBody } from '$lib/server/services/estimates';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const done = await priceEstimateBody(user, await readJsonBytes(event.request));
		return done.saved ? jsonResponse(done.priced, 201) : jsonBytesResponse(done.json);
	});

export const GET: RequestHandler = (event) =>
	answer(async () => {
		const user = requireRole(event, 'owner', 'estimator', 'sales');
		const parsed = estimateListQuerySchema.safeParse(queryObject(event.url.searchParams));
		if (!parsed.success) throw zodInvalid(parsed.error, 'query');
		const { site, ...rest } = parsed.data;
		return json(await listEstimates(user.companyId, { ...rest, siteId: site }));
	});
