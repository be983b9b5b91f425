import { redirect } from '@sveltejs/kit';
import { AUDIT_PAGE_SIZE, auditSearch, readAuditFilters } from '$lib/schemas/audit-filters';
import { requireRole } from '$lib/server/auth/guard';
import { getDb } from '$lib/server/db';
import { auditActors, listAudit } from '$lib/server/services/audit';
import type { PageServerLoad } from './$types';

/** Read-only: the log has no action, and the database refuses edits to it (migration 0011). */
export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner');
	const { filters, ignored } = readAuditFilters(event.url.searchParams);
	const db = await getDb();
	const { page, ...rest } = filters;
	const [list, actors] = await Promise.all([
		listAudit(db, user.companyId, { ...rest, page, pageSize: AUDIT_PAGE_SIZE }),
		auditActors(db, user.companyId)
	]);
	// A page past the end (an old link): go to the last page instead.
	if (list.items.length === 0 && list.total > 0 && page > 1) {
		redirect(303, `/audit${auditSearch(filters, Math.ceil(list.total / AUDIT_PAGE_SIZE))}`);
	}
	return { filters, ignored, list, actors };
};
