import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/** Liveness, and the empty endpoint the API benchmark compares against. */
export const GET: RequestHandler = () => json({ ok: true });
export const POST: RequestHandler = async ({ request }) => {
	await request.arrayBuffer();
	return json({ ok: true });
};
