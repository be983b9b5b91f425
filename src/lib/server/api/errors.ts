import { json } from '@sveltejs/kit';
import type { z } from 'zod';

/** One bad field: `path` is dotted (facets.0.pitch); '' means the body as a whole. */
export interface ApiIssue {
	path: string;
	message: string;
}

/** Every 4xx this API sends has this body. */
export interface ApiErrorBody {
	message: string;
	issues?: ApiIssue[];
}

/** An expected refusal; route files turn it into a JSON answer with apiErrorResponse(). */
export class ApiError extends Error {
	constructor(
		readonly status: number,
		message: string,
		readonly issues?: ApiIssue[]
	) {
		super(message);
		this.name = 'ApiError';
	}
}

export const toPath = (path: ReadonlyArray<PropertyKey>): string => path.map(String).join('.');

/** zod (or model) issues to the API's issue list, one entry per bad field. */
export function issuesOf(
	issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>
): ApiIssue[] {
	return issues.map((i) => ({ path: toPath(i.path), message: i.message }));
}

export function invalid(issues: ApiIssue[], what = 'request'): ApiError {
	const names = [...new Set(issues.map((i) => i.path || 'body'))];
	const shown =
		names.slice(0, 5).join(', ') + (names.length > 5 ? ` and ${names.length - 5} more` : '');
	return new ApiError(
		400,
		`The ${what} has ${issues.length === 1 ? 'a problem' : `${issues.length} problems`}: ${shown}.`,
		issues
	);
}

export function zodInvalid(error: z.ZodError, what?: string): ApiError {
	return invalid(issuesOf(error.issues), what);
}

export function apiErrorResponse(e: ApiError): Response {
	const body: ApiErrorBody = { message: e.message, ...(e.issues ? { issues: e.issues } : {}) };
	return json(body, { status: e.status });
}

/**
 * Runs a handler and answers its ApiErrors as JSON. Anything else (kit's error() and redirects
 * included) passes through to SvelteKit unchanged.
 */
export async function answer(run: () => Promise<Response> | Response): Promise<Response> {
	try {
		return await run();
	} catch (e) {
		if (e instanceof ApiError) return apiErrorResponse(e);
		throw e;
	}
}
