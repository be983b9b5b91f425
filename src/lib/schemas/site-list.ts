import { z } from 'zod';

export const SITE_PAGE_SIZE = 50;
export const MAX_SITE_PAGE_SIZE = 100;

const wholeNumber = (field: string, min: number, max: number, fallback: number) =>
	z.coerce
		.number({ error: `${field} must be a whole number` })
		.int({ error: `${field} must be a whole number` })
		.min(min, { error: `${field} must be at least ${min}` })
		.max(max, { error: `${field} must be at most ${max}` })
		.default(fallback);

/** `GET /api/sites` and the Sites page: a search and one page of the list, never all of it. */
export const siteListQuerySchema = z.object({
	q: z
		.string()
		.max(200, { error: 'q must be at most 200 characters' })
		.optional()
		.describe('Part of the address or the customer name, any case.'),
	page: wholeNumber('page', 1, 100_000, 1).describe('1-based page number.'),
	pageSize: wholeNumber('pageSize', 1, MAX_SITE_PAGE_SIZE, SITE_PAGE_SIZE).describe(
		`Sites per page, at most ${MAX_SITE_PAGE_SIZE}.`
	)
});
