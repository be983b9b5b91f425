import { z } from 'zod';
import { AUDIT_KINDS, type AuditKind } from '$lib/audit';

export const AUDIT_PAGE_SIZE = 50;

/**
 * The audit page's filters as they arrive in the address bar (a GET form, so links and reloads
 * show the same rows). Each field is read on its own: one that does not fit is dropped and named
 * in `ignored`, so an old or hand-edited link shows more rows, never an error.
 */
const fields = {
	actor: z.union([z.uuid(), z.literal('none')]),
	kind: z.enum(AUDIT_KINDS),
	from: z.iso.date(),
	to: z.iso.date(),
	page: z.coerce.number().int().min(1).max(100_000)
};

export type AuditListFilters = {
	actor?: string;
	kind?: AuditKind;
	from?: string;
	to?: string;
	page: number;
};

const FIELD_NAMES: Record<keyof typeof fields, string> = {
	actor: 'person',
	kind: 'kind of change',
	from: 'first day',
	to: 'last day',
	page: 'page number'
};

export function readAuditFilters(params: URLSearchParams): {
	filters: AuditListFilters;
	ignored: string[];
} {
	const filters: AuditListFilters = { page: 1 };
	const ignored: string[] = [];
	for (const key of Object.keys(fields) as (keyof typeof fields)[]) {
		const raw = params.get(key);
		if (raw === null || raw.trim() === '') continue;
		const got = fields[key].safeParse(raw.trim());
		if (!got.success) {
			ignored.push(FIELD_NAMES[key]);
			continue;
		}
		(filters as Record<string, unknown>)[key] = got.data;
	}
	// A range that ends before it starts matches nothing: leave it out and say so.
	if (filters.from && filters.to && filters.from > filters.to) {
		delete filters.from;
		delete filters.to;
		ignored.push('date range (it ends before it starts)');
	}
	return { filters, ignored };
}

/** The query string for these filters on a given page; page 1 and empty filters are left out. */
export function auditSearch(f: Omit<AuditListFilters, 'page'>, page = 1): string {
	const q = new URLSearchParams();
	if (f.actor) q.set('actor', f.actor);
	if (f.kind) q.set('kind', f.kind);
	if (f.from) q.set('from', f.from);
	if (f.to) q.set('to', f.to);
	if (page > 1) q.set('page', String(page));
	const s = q.toString();
	return s ? `?${s}` : '';
}
