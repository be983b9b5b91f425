import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { EXPORT_KINDS, exportCsv, type ExportKind } from '$lib/server/services/csv-export';
import { localToday } from '$lib/jobs/week';
import type { RequestHandler } from './$types';

/** `/data/customers` etc.: the company's list as a CSV file to download. */
export const GET: RequestHandler = async (event) => {
	const user = requireRole(event, 'owner');
	const kind = event.params.kind;
	if (!(EXPORT_KINDS as readonly string[]).includes(kind)) {
		error(404, `No export called "${kind}"; choose ${EXPORT_KINDS.join(', ')}.`);
	}
	const csv = await exportCsv(user.companyId, kind as ExportKind);
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="clearpitch-${kind}-${localToday()}.csv"`,
			'cache-control': 'private, no-store'
		}
	});
};
