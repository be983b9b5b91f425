/**
 * What a service refuses, in the domain's words. Services throw these and know nothing of HTTP;
 * `src/lib/server/api/errors.ts` (for endpoints) and route files (for form actions) turn them
 * into answers. Plain TypeScript with no imports, so pricing-thread code may use it too.
 */

/** One bad field: `path` is dotted (facets.0.pitch); '' means the request as a whole. */
export interface Issue {
	path: string;
	message: string;
}

export abstract class DomainError extends Error {
	constructor(
		message: string,
		readonly issues?: Issue[]
	) {
		super(message);
		this.name = new.target.name;
	}
}

/** The thing asked for is not the caller's, or does not exist. */
export class NotFound extends DomainError {}

/** The request itself is wrong: the issues say which fields and why. */
export class Invalid extends DomainError {
	constructor(message: string, issues: Issue[]) {
		super(message, issues);
	}

	/** A refusal whose message names the bad fields (the first five) and lists them all. */
	static of(issues: Issue[], what = 'request'): Invalid {
		return new Invalid(issuesSummary(issues, what), issues);
	}
}

/** The request is sound but the data's current state does not allow it. */
export class Conflict extends DomainError {}

/** The thing existed but is over for good (a proposal past its validity date). */
export class Gone extends DomainError {}

/** The caller's role may not do this. */
export class Forbidden extends DomainError {}

/** "The request has 2 problems: facets.0.pitch, siteId." */
export function issuesSummary(issues: Issue[], what = 'request'): string {
	const names = [...new Set(issues.map((i) => i.path || 'body'))];
	const shown =
		names.slice(0, 5).join(', ') + (names.length > 5 ? ` and ${names.length - 5} more` : '');
	return `The ${what} has ${issues.length === 1 ? 'a problem' : `${issues.length} problems`}: ${shown}.`;
}
