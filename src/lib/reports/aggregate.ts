/**
 * The owner's report figures, from plain facts: no framework, no database, no clock. Money stays
 * in integer cents; a share of an estimate's money is split so its parts add up to the cent.
 */
import { ESTIMATE_STATUSES, type EstimateStatus } from '../estimate-status';
import { GROWTH_GRADES, MATERIALS, type GrowthGrade, type Material } from '../estimating/types';
import type { EstimateFact, JobFact, ProposalFact, SuggestionFact } from './types';

/** `2026-11` of an ISO date or date-time (the UTC month of a date-time). */
export const monthOf = (iso: string): string => new Date(iso).toISOString().slice(0, 7);

const pct = (part: number, whole: number): number | null =>
	whole === 0 ? null : (part / whole) * 100;

/**
 * Splits `total` cents in proportion to `weights`, by largest remainder (Hamilton's method), so
 * the parts are whole cents that add up to `total` exactly. Equal parts when no weight is above 0.
 */
export function allocate(total: number, weights: readonly number[]): number[] {
	if (weights.length === 0) return [];
	const w = weights.map((x) => (Number.isFinite(x) && x > 0 ? x : 0));
	const sum = w.reduce((a, b) => a + b, 0);
	const shares = sum > 0 ? w.map((x) => (total * x) / sum) : w.map(() => total / w.length);
	const parts = shares.map(Math.floor);
	let left = total - parts.reduce((a, b) => a + b, 0);
	const order = shares
		.map((s, i) => ({ i, r: s - Math.floor(s) }))
		.sort((a, b) => b.r - a.r || a.i - b.i);
	for (let k = 0; left > 0; k = (k + 1) % order.length, left--) parts[order[k].i] += 1;
	return parts;
}

export interface PipelineRow {
	status: EstimateStatus;
	count: number;
	valueCents: number;
}

/** Every status in its order, with how many estimates are in it and their total price. */
export function pipeline(estimates: readonly EstimateFact[]): PipelineRow[] {
	return ESTIMATE_STATUSES.map((status) => {
		const here = estimates.filter((e) => e.status === status);
		return {
			status,
			count: here.length,
			valueCents: here.reduce((a, e) => a + e.totalCents, 0)
		};
	});
}

const WON: readonly EstimateStatus[] = ['accepted', 'scheduled', 'done', 'paid'];
const LOST: readonly EstimateStatus[] = ['declined'];
/** Statuses only a sent estimate reaches (expired is left out: a ready one can expire unsent). */
const SENT_OR_LATER: readonly EstimateStatus[] = ['sent', ...WON, ...LOST];

export interface WinRateRow {
	month: string;
	sent: number;
	won: number;
	lost: number;
	open: number;
	/** won ÷ sent × 100; null in a month with nothing sent. */
	winRatePct: number | null;
}

/**
 * Estimates sent, by the month first sent, and how they ended. An estimate with proposals is
 * dated by its first proposal and won by an accepted answer or a status past accepted; one marked
 * sent by hand (no proposal) is dated by the estimate itself.
 */
export function winRate(
	estimates: readonly EstimateFact[],
	proposals: readonly ProposalFact[]
): WinRateRow[] {
	const byEstimate = new Map<string, ProposalFact[]>();
	for (const p of proposals)
		byEstimate.set(p.estimateId, [...(byEstimate.get(p.estimateId) ?? []), p]);
	const months = new Map<string, WinRateRow>();
	for (const e of estimates) {
		const ps = byEstimate.get(e.id) ?? [];
		if (ps.length === 0 && !SENT_OR_LATER.includes(e.status)) continue;
		const sentAt = ps.length ? ps.map((p) => p.sentAt).sort()[0] : e.createdAt;
		const won = WON.includes(e.status) || ps.some((p) => p.decision === 'accepted');
		const lost =
			!won &&
			(LOST.includes(e.status) ||
				e.status === 'expired' ||
				ps.some((p) => p.decision === 'declined'));
		const m = monthOf(sentAt);
		const row = months.get(m) ?? { month: m, sent: 0, won: 0, lost: 0, open: 0, winRatePct: null };
		row.sent += 1;
		if (won) row.won += 1;
		else if (lost) row.lost += 1;
		else row.open += 1;
		months.set(m, row);
	}
	return [...months.values()]
		.sort((a, b) => a.month.localeCompare(b.month))
		.map((r) => ({ ...r, winRatePct: pct(r.won, r.sent) }));
}

export interface MoneyRow {
	revenueCents: number;
	costCents: number;
	marginCents: number;
	/** margin ÷ revenue × 100; null without revenue. */
	marginPct: number | null;
}

const money = (revenueCents: number, costCents: number): MoneyRow => ({
	revenueCents,
	costCents,
	marginCents: revenueCents - costCents,
	marginPct: pct(revenueCents - costCents, revenueCents)
});

/** Done jobs with their estimate: the work that has earned its price. */
function doneWork(estimates: readonly EstimateFact[], jobs: readonly JobFact[]) {
	const byId = new Map(estimates.map((e) => [e.id, e]));
	return jobs
		.filter((j) => j.done)
		.map((j) => ({ job: j, estimate: byId.get(j.estimateId) }))
		.filter((w): w is { job: JobFact; estimate: EstimateFact } => !!w.estimate);
}

const costOf = (e: EstimateFact) => e.chemicalCents + e.labourCents + e.overheadCents;

/**
 * Revenue (the price before tax: tax is collected for others), cost (chemical, labour and
 * overhead, as estimated) and margin of done jobs, by the month each was done.
 */
export function revenueByMonth(
	estimates: readonly EstimateFact[],
	jobs: readonly JobFact[]
): (MoneyRow & { month: string; jobs: number })[] {
	const months = new Map<string, { revenue: number; cost: number; jobs: number }>();
	for (const { job, estimate } of doneWork(estimates, jobs)) {
		const when = job.doneAt ?? job.date;
		if (!when) continue;
		const m = monthOf(when);
		const t = months.get(m) ?? { revenue: 0, cost: 0, jobs: 0 };
		t.revenue += estimate.preTaxCents;
		t.cost += costOf(estimate);
		t.jobs += 1;
		months.set(m, t);
	}
	return [...months.entries()]
		.sort(([a], [b]) => a.localeCompare(b))
		.map(([month, t]) => ({ month, jobs: t.jobs, ...money(t.revenue, t.cost) }));
}

/**
 * The same done work by roof material. An estimate's money is shared among its facets: price and
 * overhead (a share of price) by each facet's price, chemical by its mix, labour by its hours.
 */
export function revenueByMaterial(
	estimates: readonly EstimateFact[],
	jobs: readonly JobFact[]
): (MoneyRow & { material: Material; squares: number })[] {
	const t = new Map<Material, { revenue: number; cost: number; squares: number }>();
	for (const { estimate: e } of doneWork(estimates, jobs)) {
		if (e.facets.length === 0) continue;
		const price = e.facets.map((f) => f.priceCents);
		const revenue = allocate(e.preTaxCents, price);
		const overhead = allocate(e.overheadCents, price);
		const chemical = allocate(
			e.chemicalCents,
			e.facets.map((f) => f.mixGal)
		);
		const labour = allocate(
			e.labourCents,
			e.facets.map((f) => f.labourHours)
		);
		e.facets.forEach((f, i) => {
			const row = t.get(f.material) ?? { revenue: 0, cost: 0, squares: 0 };
			row.revenue += revenue[i];
			row.cost += overhead[i] + chemical[i] + labour[i];
			row.squares += f.squares;
			t.set(f.material, row);
		});
	}
	return MATERIALS.filter((m) => t.has(m)).map((material) => {
		const r = t.get(material)!;
		return { material, squares: r.squares, ...money(r.revenue, r.cost) };
	});
}

export interface ChemicalRow {
	jobId: string;
	label: string;
	date: string | null;
	stockGalExpected: number;
	stockGalUsed: number;
	/** used − expected. */
	stockGalDifference: number;
	stockDifferencePct: number | null;
	surfactantOzExpected: number;
	surfactantOzUsed: number | null;
}

/** Stock (sodium hypochlorite) the estimate expected against what the crew logged, per job. */
export function chemical(jobs: readonly JobFact[]): {
	rows: ChemicalRow[];
	total: {
		jobs: number;
		stockGalExpected: number;
		stockGalUsed: number;
		stockGalDifference: number;
		stockDifferencePct: number | null;
	};
} {
	const rows = jobs
		.filter((j): j is JobFact & { stockGalUsed: number } => j.stockGalUsed !== null)
		.map((j) => ({
			jobId: j.id,
			label: j.label,
			date: j.date,
			stockGalExpected: j.stockGalExpected,
			stockGalUsed: j.stockGalUsed,
			stockGalDifference: j.stockGalUsed - j.stockGalExpected,
			stockDifferencePct: pct(j.stockGalUsed - j.stockGalExpected, j.stockGalExpected),
			surfactantOzExpected: j.surfactantOzExpected,
			surfactantOzUsed: j.surfactantOzUsed
		}))
		.sort((a, b) => (a.date ?? '').localeCompare(b.date ?? '') || a.label.localeCompare(b.label));
	const expected = rows.reduce((a, r) => a + r.stockGalExpected, 0);
	const used = rows.reduce((a, r) => a + r.stockGalUsed, 0);
	return {
		rows,
		total: {
			jobs: rows.length,
			stockGalExpected: expected,
			stockGalUsed: used,
			stockGalDifference: used - expected,
			stockDifferencePct: pct(used - expected, expected)
		}
	};
}

export interface PricePerSquareRow {
	material: Material;
	growth: GrowthGrade;
	facets: number;
	squares: number;
	priceCents: number;
	/** Σ price ÷ Σ squares, in cents (a squares-weighted average); null for no squares. */
	centsPerSquare: number | null;
}

/**
 * Average facet price per square of every estimate past draft, by material and growth grade.
 * A facet's price is its own line (per-square rate with its multipliers), before the minimum
 * charge, extras, discount and tax, which belong to the job, not to a square of roof.
 */
export function pricePerSquare(estimates: readonly EstimateFact[]): PricePerSquareRow[] {
	const key = (m: Material, g: GrowthGrade) => `${m}|${g}`;
	const t = new Map<string, { facets: number; squares: number; price: number }>();
	for (const e of estimates) {
		if (e.status === 'draft') continue;
		for (const f of e.facets) {
			const k = key(f.material, f.growth);
			const r = t.get(k) ?? { facets: 0, squares: 0, price: 0 };
			r.facets += 1;
			r.squares += f.squares;
			r.price += f.priceCents;
			t.set(k, r);
		}
	}
	return MATERIALS.flatMap((material) =>
		GROWTH_GRADES.filter((g) => t.has(key(material, g))).map((growth) => {
			const r = t.get(key(material, growth))!;
			return {
				material,
				growth,
				facets: r.facets,
				squares: r.squares,
				priceCents: r.price,
				centsPerSquare: r.squares > 0 ? r.price / r.squares : null
			};
		})
	);
}

export interface HoursRow {
	jobId: string;
	label: string;
	date: string | null;
	hoursExpected: number;
	hoursLogged: number | null;
	/** logged − expected; null until hours are logged. */
	difference: number | null;
}

/**
 * Crew hours the model expected against those recorded, per done job; the total compares only
 * jobs with hours recorded, so a job not yet entered does not read as time saved.
 */
export function crewHours(jobs: readonly JobFact[]): {
	rows: HoursRow[];
	total: {
		jobs: number;
		hoursExpected: number;
		hoursLogged: number;
		difference: number;
		differencePct: number | null;
	};
} {
	const rows = jobs
		.filter((j) => j.done)
		.map((j) => ({
			jobId: j.id,
			label: j.label,
			date: j.date,
			hoursExpected: j.hoursExpected,
			hoursLogged: j.hoursLogged,
			difference: j.hoursLogged === null ? null : j.hoursLogged - j.hoursExpected
		}))
		.sort((a, b) => (a.date ?? '').localeCompare(b.date ?? '') || a.label.localeCompare(b.label));
	const logged = rows.filter((r) => r.hoursLogged !== null);
	const expected = logged.reduce((a, r) => a + r.hoursExpected, 0);
	const hours = logged.reduce((a, r) => a + (r.hoursLogged ?? 0), 0);
	return {
		rows,
		total: {
			jobs: logged.length,
			hoursExpected: expected,
			hoursLogged: hours,
			difference: hours - expected,
			differencePct: pct(hours - expected, expected)
		}
	};
}

export interface SuggestionRow {
	suggested: GrowthGrade;
	/** Facets by the grade chosen, in the order of GROWTH_GRADES. */
	chosen: number[];
	facets: number;
	/** Facets whose chosen grade is the suggested one. */
	kept: number;
	keptPct: number | null;
}

/**
 * Suggested growth grade against the grade chosen, one row per suggested grade that occurs,
 * with the share kept; the total adds up every facet with a suggestion.
 */
export function suggestionsKept(facts: readonly SuggestionFact[]): {
	rows: SuggestionRow[];
	total: { chosen: number[]; facets: number; kept: number; keptPct: number | null };
} {
	const rows = GROWTH_GRADES.map((suggested) => {
		const here = facts.filter((f) => f.suggested === suggested);
		const kept = here.filter((f) => f.chosen === suggested).length;
		return {
			suggested,
			chosen: GROWTH_GRADES.map((g) => here.filter((f) => f.chosen === g).length),
			facets: here.length,
			kept,
			keptPct: pct(kept, here.length)
		};
	}).filter((r) => r.facets > 0);
	const kept = rows.reduce((a, r) => a + r.kept, 0);
	return {
		rows,
		total: {
			chosen: GROWTH_GRADES.map((_, i) => rows.reduce((a, r) => a + r.chosen[i], 0)),
			facets: facts.length,
			kept,
			keptPct: pct(kept, facts.length)
		}
	};
}
