import { z } from 'zod';
import { ESTIMATE_STATUSES } from '$lib/estimate-status';

export const ESTIMATES_PAGE_SIZE = 20;

/**
 * The Estimates list's filters as they arrive in the address bar. A link can be old, hand-edited
 * or cut short, so each field is read on its own: one that does not fit is dropped (the list shows
 * more, never fails) and named in `ignored` so the page can say so.
 */
const fields = {
	status: z.enum(ESTIMATE_STATUSES),
	site: z.uuid(),
	text: z.string().trim().min(1).max(200),
	page: z.coerce.number().int().min(1).max(100_000)
};

export type EstimateListFilters = {
	status?: (typeof ESTIMATE_STATUSES)[number];
	site?: string;
	text?: string;
	page: number;
};

const FIELD_NAMES: Record<keyof typeof fields, string> = {
	status: 'status',
	site: 'site',
	text: 'search text',
	page: 'page number'
};

export function readEstimateListFilters(params: URLSearchParams): {
	filters: EstimateListFilters;
	ignored: string[];
} {
	const filters: EstimateListFilters = { page: 1 };
	const ignored: string[] = [];
	for (const key of Object.keys(fields) as (keyof typeof fields)[]) {
		const raw = params.get(key);
		if (raw === null || raw.trim() === '') continue;
		const got = fields[key].safeParse(raw);
		if (!got.success) {
			ignored.push(FIELD_NAMES[key]);
			continue;
		}
		(filters as Record<string, unknown>)[key] = got.data;
	}
	return { filters, ignored };
}

/** The query string for these filters on a given page; page 1 and empty filters are left out. */
export function estimateListSearch(f: Omit<EstimateListFilters, 'page'>, page = 1): string {
	const q = new URLSearchParams();
	if (f.text) q.set('text', f.text);
	if (f.status) q.set('status', f.status);
	if (f.site) q.set('site', f.site);
	if (page > 1) q.set('page', String(page));
	const s = q.toString();
	return s ? `?${s}` : '';
}
