import { issuesSummary } from '../services/errors';

/**
 * API refusals as plain data. Pricing runs on a worker thread, and an Error subclass does not
 * survive the trip back; a Refusal does, and ApiError.from() turns it into the answer.
 */

/** One bad field: `path` is dotted (facets.0.pitch); '' means the body as a whole. */
export interface ApiIssue {
	path: string;
	message: string;
}

export interface Refusal {
	status: number;
	message: string;
	issues?: ApiIssue[];
}

export const toPath = (path: ReadonlyArray<PropertyKey>): string => path.map(String).join('.');

/** zod (or model) issues to the API's issue list, one entry per bad field. */
export function issuesOf(
	issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>
): ApiIssue[] {
	return issues.map((i) => ({ path: toPath(i.path), message: i.message }));
}

/** 400 whose message names the bad fields (the first five) and whose issues list them all. */
export function invalidRefusal(issues: ApiIssue[], what = 'request'): Refusal {
	return { status: 400, message: issuesSummary(issues, what), issues };
}

const decoder = new TextDecoder('utf-8', { fatal: false });

/** A JSON body's bytes to its value, or the 400 for an empty body or one that is not JSON. */
export function parseJsonBody(
	bytes: Uint8Array
): { ok: true; value: unknown } | { ok: false; refusal: Refusal } {
	const text = decoder.decode(bytes);
	if (text.trim() === '') {
		return {
			ok: false,
			refusal: {
				status: 400,
				message: 'The request body is empty; send a JSON object.',
				issues: [{ path: '', message: 'body is empty' }]
			}
		};
	}
	try {
		return { ok: true, value: JSON.parse(text) };
	} catch (e) {
		const why = e instanceof SyntaxError ? e.message : 'not JSON';
		return {
			ok: false,
			refusal: {
				status: 400,
				message: `The request body is not valid JSON: ${why}`,
				issues: [{ path: '', message: `invalid JSON: ${why}` }]
			}
		};
	}
}
