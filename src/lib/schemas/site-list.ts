import { z } from 'zod';
import { pageNumber, searchText, wholeNumber } from './list-query';

export const SITE_PAGE_SIZE = 50;
export const MAX_SITE_PAGE_SIZE = 100;

/** `GET /api/sites` and the Sites page: a search and one page of the list, never all of it. */
export const siteListQuerySchema = z.object({
	q: searchText('q'),
	page: pageNumber(),
	pageSize: wholeNumber('pageSize', 1, MAX_SITE_PAGE_SIZE, SITE_PAGE_SIZE).describe(
		`Sites per page, at most ${MAX_SITE_PAGE_SIZE}.`
	)
});
