import { error } from '@sveltejs/kit';
import { toCsv } from '$lib/csv/cells';
import { localToday } from '$lib/jobs/week';
import { csvFigure, REPORT_IDS, reportTables, type ReportId } from '$lib/reports/tables';
import { requireRole } from '$lib/server/auth/guard';
import { reportFacts } from '$lib/server/services/reports';
import type { RequestHandler } from './$types';

/** `/reports/pipeline` etc.: one report's table, as shown under its chart, as a CSV file. */
export const GET: RequestHandler = async (event) => {
	const user = requireRole(event, 'owner');
	const id = event.params.table;
	if (!(REPORT_IDS as readonly string[]).includes(id)) {
		error(404, `No report called "${id}"; choose ${REPORT_IDS.join(', ')}.`);
	}
	const t = reportTables(await reportFacts(user.companyId))[id as ReportId];
	const line = (r: (string | number | null)[]) => r.map((v, i) => csvFigure(v, t.columns[i].kind));
	const csv = toCsv(
		t.columns.map((c) => c.label),
		[...t.rows.map(line), ...(t.total ? [line(t.total)] : [])]
	);
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="clearpitch-report-${id}-${localToday()}.csv"`,
			'cache-control': 'private, no-store'
		}
	});
};
