import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { openApiDocument } from '$lib/server/openapi';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = (event) => {
	requireRole(event, 'owner', 'estimator', 'sales');
	return json(openApiDocument());
};
