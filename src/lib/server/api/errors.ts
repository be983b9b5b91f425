import { json } from '@sveltejs/kit';
import type { z } from 'zod';
import { Conflict, DomainError, Forbidden, Gone, Invalid, NotFound } from '../services/errors';
import { invalidRefusal, issuesOf, type ApiIssue, type Refusal } from './refusal';

export { type ApiIssue } from './refusal';

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

	static from(r: Refusal): ApiError {
		return new ApiError(r.status, r.message, r.issues);
	}
}

export function invalid(issues: ApiIssue[], what = 'request'): ApiError {
	return ApiError.from(invalidRefusal(issues, what));
}

export function zodInvalid(error: z.ZodError, what?: string): ApiError {
	return invalid(issuesOf(error.issues), what);
}

export function apiErrorResponse(e: ApiError): Response {
	const body: ApiErrorBody = { message: e.message, ...(e.issues ? { issues: e.issues } : {}) };
	return json(body, { status: e.status });
}

/** The one place a service's refusal becomes an HTTP status. */
export function statusOf(e: DomainError): number {
	if (e instanceof Invalid) return 400;
	if (e instanceof Forbidden) return 403;
	if (e instanceof NotFound) return 404;
	if (e instanceof Conflict) return 409;
	if (e instanceof Gone) return 410;
	return 400;
}

export function fromDomain(e: DomainError): ApiError {
	return new ApiError(statusOf(e), e.message, e.issues);
}

/**
 * Runs a handler and answers its ApiErrors and the services' DomainErrors as JSON. Anything else (kit's error() and redirects
 * included) passes through to SvelteKit unchanged.
 */
export async function answer(run: () => Promise<Response> | Response): Promise<Response> {
	try {
		return await run();
	} catch (e) {
		if (e instanceof ApiError) return apiErrorResponse(e);
		if (e instanceof DomainError) return apiErrorResponse(fromDomain(e));
		throw e;
	}
}
