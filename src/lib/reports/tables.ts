/**
 * Each report as a table: the same rows the page shows beside its chart and the CSV download
 * writes. Plain TypeScript, shared by the page and the server.
 */
import { GROWTH_LABELS, MATERIAL_LABELS } from '../components/estimate/format';
import { STATUS_LABELS } from '../components/estimate/status';
import {
	chemical,
	crewHours,
	pipeline,
	pricePerSquare,
	revenueByMaterial,
	revenueByMonth,
	suggestionsKept,
	winRate
} from './aggregate';
import { GROWTH_GRADES } from '../estimating/types';
import type { ReportFacts } from './types';

export const REPORT_IDS = [
	'pipeline',
	'win-rate',
	'revenue-by-month',
	'revenue-by-material',
	'chemical',
	'price-per-square',
	'crew-hours',
	'growth-suggestions'
] as const;
export type ReportId = (typeof REPORT_IDS)[number];

/** How a column's figures read: money in cents, hours, gallons, a percentage, a count. */
export type ColumnKind = 'text' | 'money' | 'count' | 'hours' | 'gal' | 'oz' | 'squares' | 'pct';

export interface ReportTable {
	id: ReportId;
	title: string;
	columns: { label: string; kind: ColumnKind }[];
	rows: (string | number | null)[][];
	/** A totals row, when adding up the rows means something. */
	total?: (string | number | null)[];
}

const col = (label: string, kind: ColumnKind) => ({ label, kind });

export function reportTables(facts: ReportFacts): Record<ReportId, ReportTable> {
	const pipe = pipeline(facts.estimates);
	const win = winRate(facts.estimates, facts.proposals);
	const month = revenueByMonth(facts.estimates, facts.jobs);
	const material = revenueByMaterial(facts.estimates, facts.jobs);
	const chem = chemical(facts.jobs);
	const pps = pricePerSquare(facts.estimates);
	const hours = crewHours(facts.jobs);
	const kept = suggestionsKept(facts.suggestions);
	const sum = <T>(rows: T[], f: (r: T) => number) => rows.reduce((a, r) => a + f(r), 0);
	const marginPct = (rev: number, margin: number) => (rev === 0 ? null : (margin / rev) * 100);
	return {
		pipeline: {
			id: 'pipeline',
			title: 'Pipeline by status',
			columns: [col('Status', 'text'), col('Estimates', 'count'), col('Value', 'money')],
			rows: pipe.map((r) => [STATUS_LABELS[r.status], r.count, r.valueCents]),
			total: ['All', sum(pipe, (r) => r.count), sum(pipe, (r) => r.valueCents)]
		},
		'win-rate': {
			id: 'win-rate',
			title: 'Win rate of sent proposals by month',
			columns: [
				col('Month', 'text'),
				col('Sent', 'count'),
				col('Won', 'count'),
				col('Lost', 'count'),
				col('Open', 'count'),
				col('Win rate', 'pct')
			],
			rows: win.map((r) => [r.month, r.sent, r.won, r.lost, r.open, r.winRatePct]),
			total: win.length
				? [
						'All',
						sum(win, (r) => r.sent),
						sum(win, (r) => r.won),
						sum(win, (r) => r.lost),
						sum(win, (r) => r.open),
						(sum(win, (r) => r.won) / sum(win, (r) => r.sent)) * 100
					]
				: undefined
		},
		'revenue-by-month': {
			id: 'revenue-by-month',
			title: 'Revenue, cost and margin by month',
			columns: [
				col('Month', 'text'),
				col('Jobs done', 'count'),
				col('Revenue', 'money'),
				col('Cost', 'money'),
				col('Margin', 'money'),
				col('Margin %', 'pct')
			],
			rows: month.map((r) => [
				r.month,
				r.jobs,
				r.revenueCents,
				r.costCents,
				r.marginCents,
				r.marginPct
			]),
			total: month.length
				? [
						'All',
						sum(month, (r) => r.jobs),
						sum(month, (r) => r.revenueCents),
						sum(month, (r) => r.costCents),
						sum(month, (r) => r.marginCents),
						marginPct(
							sum(month, (r) => r.revenueCents),
							sum(month, (r) => r.marginCents)
						)
					]
				: undefined
		},
		'revenue-by-material': {
			id: 'revenue-by-material',
			title: 'Revenue, cost and margin by material',
			columns: [
				col('Material', 'text'),
				col('Squares', 'squares'),
				col('Revenue', 'money'),
				col('Cost', 'money'),
				col('Margin', 'money'),
				col('Margin %', 'pct')
			],
			rows: material.map((r) => [
				MATERIAL_LABELS[r.material],
				r.squares,
				r.revenueCents,
				r.costCents,
				r.marginCents,
				r.marginPct
			]),
			total: material.length
				? [
						'All',
						sum(material, (r) => r.squares),
						sum(material, (r) => r.revenueCents),
						sum(material, (r) => r.costCents),
						sum(material, (r) => r.marginCents),
						marginPct(
							sum(material, (r) => r.revenueCents),
							sum(material, (r) => r.marginCents)
						)
					]
				: undefined
		},
		chemical: {
			id: 'chemical',
			title: 'Stock estimated and used per job',
			columns: [
				col('Job', 'text'),
				col('Date', 'text'),
				col('Stock estimated (gal)', 'gal'),
				col('Stock used (gal)', 'gal'),
				col('Difference (gal)', 'gal'),
				col('Difference %', 'pct'),
				col('Surfactant estimated (fl oz)', 'oz'),
				col('Surfactant used (fl oz)', 'oz')
			],
			rows: chem.rows.map((r) => [
				r.label,
				r.date,
				r.stockGalExpected,
				r.stockGalUsed,
				r.stockGalDifference,
				r.stockDifferencePct,
				r.surfactantOzExpected,
				r.surfactantOzUsed
			]),
			total: chem.rows.length
				? [
						`All ${chem.total.jobs} jobs`,
						null,
						chem.total.stockGalExpected,
						chem.total.stockGalUsed,
						chem.total.stockGalDifference,
						chem.total.stockDifferencePct,
						sum(chem.rows, (r) => r.surfactantOzExpected),
						sum(chem.rows, (r) => r.surfactantOzUsed ?? 0)
					]
				: undefined
		},
		'price-per-square': {
			id: 'price-per-square',
			title: 'Average price per square by material and growth grade',
			columns: [
				col('Material', 'text'),
				col('Growth grade', 'text'),
				col('Facets', 'count'),
				col('Squares', 'squares'),
				col('Facet price', 'money'),
				col('Price per square', 'money')
			],
			rows: pps.map((r) => [
				MATERIAL_LABELS[r.material],
				GROWTH_LABELS[r.growth],
				r.facets,
				r.squares,
				r.priceCents,
				r.centsPerSquare
			])
		},
		'crew-hours': {
			id: 'crew-hours',
			title: 'Crew hours estimated and recorded per done job',
			columns: [
				col('Job', 'text'),
				col('Date', 'text'),
				col('Hours estimated', 'hours'),
				col('Hours recorded', 'hours'),
				col('Difference (h)', 'hours')
			],
			rows: hours.rows.map((r) => [r.label, r.date, r.hoursExpected, r.hoursLogged, r.difference]),
			total: hours.total.jobs
				? [
						`${hours.total.jobs} job${hours.total.jobs === 1 ? '' : 's'} with hours recorded`,
						null,
						hours.total.hoursExpected,
						hours.total.hoursLogged,
						hours.total.difference
					]
				: undefined
		},
		'growth-suggestions': {
			id: 'growth-suggestions',
			title: 'Growth grades suggested from the imagery and chosen',
			columns: [
				col('Suggested', 'text'),
				...GROWTH_GRADES.map((g) => col(`Chosen ${g}`, 'count')),
				col('Facets', 'count'),
				col('Kept', 'count'),
				col('Kept %', 'pct')
			],
			rows: kept.rows.map((r) => [
				GROWTH_LABELS[r.suggested],
				...r.chosen,
				r.facets,
				r.kept,
				r.keptPct
			]),
			total: kept.rows.length
				? ['All', ...kept.total.chosen, kept.total.facets, kept.total.kept, kept.total.keptPct]
				: undefined
		}
	};
}

/** A figure as the CSV writes it: money in dollars to the cent, others to two decimals. */
export function csvFigure(v: string | number | null, kind: ColumnKind): string | number | null {
	if (typeof v !== 'number') return v;
	if (kind === 'money') return (v / 100).toFixed(2);
	if (kind === 'count') return v;
	return Math.round(v * 100) / 100;
}
