import { z } from 'zod';

/**
 * Pieces shared by the list queries (`GET /api/estimates`, `GET /api/sites` and the pages that
 * read the same parameters from their URL), so every list answers the same words.
 */

/** A whole-number query parameter within bounds, with a default when absent. */
export const wholeNumber = (field: string, min: number, max: number, fallback: number) =>
	z.coerce
		.number({ error: `${field} must be a whole number` })
		.int({ error: `${field} must be a whole number` })
		.min(min, { error: `${field} must be at least ${min}` })
		.max(max, { error: `${field} must be at most ${max}` })
		.default(fallback);

/** A free-text search over the address or the customer's name. */
export const searchText = (field: string) =>
	z
		.string()
		.max(200, { error: `${field} must be at most 200 characters` })
		.optional()
		.describe('Part of the address or the customer name, any case.');

/** The 1-based page number. */
export const pageNumber = () => wholeNumber('page', 1, 100_000, 1).describe('1-based page number.');

/** Query parameters as zod sees them: empty ones count as absent. */
export function queryObject(params: URLSearchParams): Record<string, string> {
	const out: Record<string, string> = {};
	for (const [k, v] of params) if (v !== '') out[k] = v;
	return out;
}
