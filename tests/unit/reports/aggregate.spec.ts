// The owner's report figures, against values worked by hand below. The splitting of an amount
// into whole cents is the largest remainder (Hamilton) method; its check is the worked example
// of https://en.wikipedia.org/wiki/Largest_remainder_method (Hare quota, 10 seats). Margin is
// (price − cost) ÷ price, as docs/ and the estimating model define it; win rate = won ÷ sent and
// price per square = Σ price ÷ Σ squares are common practice with no outside source.
import { describe, expect, it } from 'vitest';
import {
	allocate,
	chemical,
	crewHours,
	monthOf,
	pipeline,
	pricePerSquare,
	revenueByMaterial,
	revenueByMonth,
	winRate
} from '../../../src/lib/reports/aggregate';
import { reportTables, csvFigure } from '../../../src/lib/reports/tables';
import type { EstimateFact, JobFact } from '../../../src/lib/reports/types';

const est = (o: Partial<EstimateFact> & Pick<EstimateFact, 'id' | 'status'>): EstimateFact => ({
	createdAt: '2026-10-05T10:00:00.000Z',
	totalCents: 0,
	preTaxCents: 0,
	chemicalCents: 0,
	labourCents: 0,
	overheadCents: 0,
	facets: [],
	...o
});

const job = (o: Partial<JobFact> & Pick<JobFact, 'id' | 'estimateId'>): JobFact => ({
	label: o.id,
	done: true,
	date: '2026-11-10',
	doneAt: '2026-11-10T15:00:00.000Z',
	hoursExpected: 0,
	hoursLogged: null,
	stockGalExpected: 0,
	stockGalUsed: null,
	surfactantOzExpected: 0,
	surfactantOzUsed: null,
	...o
});

describe('allocate (largest remainder)', () => {
	it('gives the worked example: 10 seats for 47,000/16,000/15,800/12,000/6,100/3,100 votes', () => {
		// Quotas 4.7, 1.6, 1.58, 1.2, 0.61, 0.31: seven whole seats, the last three to the largest
		// remainders 0.7, 0.61, 0.6.
		expect(allocate(10, [47_000, 16_000, 15_800, 12_000, 6_100, 3_100])).toEqual([
			5, 2, 1, 1, 1, 0
		]);
	});

	it('adds up to the cent and splits evenly without weights', () => {
		expect(allocate(100, [1, 1, 1])).toEqual([34, 33, 33]);
		expect(allocate(7, [0, 0])).toEqual([4, 3]);
		expect(allocate(0, [5, 3])).toEqual([0, 0]);
		expect(allocate(12_345, [0.3, 0.3, 0.4]).reduce((a, b) => a + b)).toBe(12_345);
	});
});

describe('pipeline', () => {
	it('counts and sums every status in order, zeros included', () => {
		const rows = pipeline([
			est({ id: 'a', status: 'draft', totalCents: 50_000 }),
			est({ id: 'b', status: 'sent', totalCents: 120_000 }),
			est({ id: 'c', status: 'sent', totalCents: 80_050 }),
			est({ id: 'd', status: 'paid', totalCents: 99_999 })
		]);
		expect(rows.map((r) => r.status)).toEqual([
			'draft',
			'ready',
			'sent',
			'accepted',
			'scheduled',
			'done',
			'paid',
			'declined',
			'expired'
		]);
		expect(rows.find((r) => r.status === 'sent')).toEqual({
			status: 'sent',
			count: 2,
			valueCents: 200_050
		});
		expect(rows.find((r) => r.status === 'ready')).toEqual({
			status: 'ready',
			count: 0,
			valueCents: 0
		});
	});
});

describe('winRate', () => {
	it('dates by the first proposal, wins by answer or status, and leaves unsent ones out', () => {
		const rows = winRate(
			[
				// October: three sent by hand (no proposal): one paid, one declined, one still sent.
				est({ id: 'p1', status: 'paid', createdAt: '2026-10-02T09:00:00Z' }),
				est({ id: 'd1', status: 'declined', createdAt: '2026-10-20T09:00:00Z' }),
				est({ id: 's1', status: 'sent', createdAt: '2026-10-31T23:59:59Z' }),
				// Never sent: not counted.
				est({ id: 'r1', status: 'ready' }),
				est({ id: 'x1', status: 'expired' }),
				// Saved in October, first proposal in November, second version accepted.
				est({ id: 'v1', status: 'sent', createdAt: '2026-10-28T09:00:00Z' }),
				// A proposal left to expire: lost.
				est({ id: 'e1', status: 'expired', createdAt: '2026-11-01T09:00:00Z' })
			],
			[
				{ estimateId: 'v1', sentAt: '2026-11-12T09:00:00Z', decision: null },
				{ estimateId: 'v1', sentAt: '2026-11-03T09:00:00Z', decision: null },
				{ estimateId: 'v1', sentAt: '2026-11-20T09:00:00Z', decision: 'accepted' },
				{ estimateId: 'e1', sentAt: '2026-11-02T09:00:00Z', decision: null }
			]
		);
		expect(rows).toEqual([
			{ month: '2026-10', sent: 3, won: 1, lost: 1, open: 1, winRatePct: (1 / 3) * 100 },
			{ month: '2026-11', sent: 2, won: 1, lost: 1, open: 0, winRatePct: 50 }
		]);
	});

	it('is empty with nothing sent', () => {
		expect(winRate([est({ id: 'a', status: 'draft' })], [])).toEqual([]);
	});
});

// Two done jobs in November, one in December, one not done. Worked by hand:
// N1: pre-tax $1,000.00, cost 150.00 + 300.00 + 120.00 = $570.00
// N2: pre-tax $500.00, cost 50.00 + 100.00 + 60.00 = $210.00
// D1: pre-tax $800.00, cost 80.00 + 200.00 + 96.00 = $376.00
// November: revenue 150,000¢, cost 78,000¢, margin 72,000¢ = 48%; December: 80,000 / 37,600 /
// 42,400 = 53%.
const N1 = est({
	id: 'n1',
	status: 'paid',
	preTaxCents: 100_000,
	chemicalCents: 15_000,
	labourCents: 30_000,
	overheadCents: 12_000,
	facets: [
		{
			material: 'asphalt_shingle',
			growth: 'G2',
			squares: 20,
			priceCents: 60_000,
			mixGal: 30,
			labourHours: 2
		},
		{ material: 'metal', growth: 'G1', squares: 10, priceCents: 20_000, mixGal: 10, labourHours: 2 }
	]
});
const N2 = est({
	id: 'n2',
	status: 'done',
	preTaxCents: 50_000,
	chemicalCents: 5_000,
	labourCents: 10_000,
	overheadCents: 6_000,
	facets: [
		{ material: 'metal', growth: 'G1', squares: 12, priceCents: 36_000, mixGal: 9, labourHours: 1 }
	]
});
const D1 = est({
	id: 'd1',
	status: 'paid',
	preTaxCents: 80_000,
	chemicalCents: 8_000,
	labourCents: 20_000,
	overheadCents: 9_600,
	facets: [
		{
			material: 'asphalt_shingle',
			growth: 'G3',
			squares: 18,
			priceCents: 72_000,
			mixGal: 40,
			labourHours: 3
		}
	]
});
const S1 = est({ id: 's1', status: 'scheduled', preTaxCents: 70_000, chemicalCents: 1 });
const JOBS = [
	job({
		id: 'j-n1',
		estimateId: 'n1',
		label: '4 Alder Row',
		hoursExpected: 4,
		hoursLogged: 5,
		stockGalExpected: 4,
		stockGalUsed: 4.5,
		surfactantOzExpected: 40,
		surfactantOzUsed: 42
	}),
	job({
		id: 'j-n2',
		estimateId: 'n2',
		label: '9 Birch Row',
		date: '2026-11-20',
		doneAt: '2026-11-30T23:00:00Z',
		hoursExpected: 2,
		stockGalExpected: 1,
		stockGalUsed: 0.8,
		surfactantOzExpected: 9,
		surfactantOzUsed: null
	}),
	job({
		id: 'j-d1',
		estimateId: 'd1',
		label: '2 Cedar Row',
		date: '2026-12-01',
		doneAt: '2026-12-01T12:00:00Z',
		hoursExpected: 3,
		hoursLogged: 2.5,
		stockGalExpected: 5
	}),
	job({
		id: 'j-s1',
		estimateId: 's1',
		label: '1 Elm Row',
		done: false,
		date: '2026-12-09',
		doneAt: null,
		hoursExpected: 6
	})
];

describe('revenueByMonth', () => {
	it('adds done jobs by the month done, before tax', () => {
		expect(revenueByMonth([N1, N2, D1, S1], JOBS)).toEqual([
			{
				month: '2026-11',
				jobs: 2,
				revenueCents: 150_000,
				costCents: 78_000,
				marginCents: 72_000,
				marginPct: 48
			},
			{
				month: '2026-12',
				jobs: 1,
				revenueCents: 80_000,
				costCents: 37_600,
				marginCents: 42_400,
				marginPct: 53
			}
		]);
	});
});

describe('revenueByMaterial', () => {
	it('splits each estimate among its facets: price and overhead by price, chemical by mix, labour by hours', () => {
		// N1 facets by price 60,000 : 20,000 = 3 : 1 → revenue 75,000 / 25,000, overhead 9,000 / 3,000;
		// by mix 30 : 10 → chemical 11,250 / 3,750; by hours 2 : 2 → labour 15,000 / 15,000.
		// Asphalt: N1 75,000 rev, cost 9,000 + 11,250 + 15,000 = 35,250; D1 80,000 rev, cost 37,600.
		//   → revenue 155,000, cost 72,850, margin 82,150, 53.0%; squares 20 + 18 = 38.
		// Metal: N1 25,000 rev, cost 3,000 + 3,750 + 15,000 = 21,750; N2 50,000 rev, cost 21,000.
		//   → revenue 75,000, cost 42,750, margin 32,250, 43%; squares 10 + 12 = 22.
		const rows = revenueByMaterial([N1, N2, D1, S1], JOBS);
		expect(rows).toEqual([
			{
				material: 'asphalt_shingle',
				squares: 38,
				revenueCents: 155_000,
				costCents: 72_850,
				marginCents: 82_150,
				marginPct: (82_150 / 155_000) * 100
			},
			{
				material: 'metal',
				squares: 22,
				revenueCents: 75_000,
				costCents: 42_750,
				marginCents: 32_250,
				marginPct: 43
			}
		]);
		// The split loses no cent: it adds up to the month report's totals.
		const sum = (k: 'revenueCents' | 'costCents') => rows.reduce((a, r) => a + r[k], 0);
		expect([sum('revenueCents'), sum('costCents')]).toEqual([230_000, 115_600]);
	});
});

describe('chemical', () => {
	it('lists jobs with stock logged and totals them', () => {
		const r = chemical(JOBS);
		expect(
			r.rows.map((x) => [x.label, x.stockGalExpected, x.stockGalUsed, x.surfactantOzUsed])
		).toEqual([
			['4 Alder Row', 4, 4.5, 42],
			['9 Birch Row', 1, 0.8, null]
		]);
		expect(r.rows[0].stockGalDifference).toBeCloseTo(0.5, 12);
		expect(r.rows[0].stockDifferencePct).toBeCloseTo(12.5, 12);
		expect(r.rows[1].stockDifferencePct).toBeCloseTo(-20, 12);
		// 4 + 1 = 5 gal estimated, 4.5 + 0.8 = 5.3 used: +0.3 gal, +6%.
		expect(r.total.jobs).toBe(2);
		expect(r.total.stockGalExpected).toBe(5);
		expect(r.total.stockGalUsed).toBeCloseTo(5.3, 12);
		expect(r.total.stockDifferencePct).toBeCloseTo(6, 10);
	});
});

describe('pricePerSquare', () => {
	it('weights by squares and skips drafts', () => {
		const draft = est({
			id: 'dr',
			status: 'draft',
			facets: [
				{ material: 'metal', growth: 'G1', squares: 100, priceCents: 1, mixGal: 1, labourHours: 1 }
			]
		});
		// Metal G1: (20,000 + 36,000) ÷ (10 + 12) = 2,545.45…¢ a square; asphalt G2 60,000 ÷ 20 = 3,000¢;
		// asphalt G3 72,000 ÷ 18 = 4,000¢.
		const rows = pricePerSquare([N1, N2, D1, draft]);
		expect(rows.map((r) => [r.material, r.growth, r.facets, r.squares, r.priceCents])).toEqual([
			['asphalt_shingle', 'G2', 1, 20, 60_000],
			['asphalt_shingle', 'G3', 1, 18, 72_000],
			['metal', 'G1', 2, 22, 56_000]
		]);
		expect(rows.map((r) => r.centsPerSquare)).toEqual([3_000, 4_000, 56_000 / 22]);
	});
});

describe('crewHours', () => {
	it('lists done jobs and totals only those with hours recorded', () => {
		const r = crewHours(JOBS);
		expect(r.rows.map((x) => [x.label, x.hoursExpected, x.hoursLogged, x.difference])).toEqual([
			['4 Alder Row', 4, 5, 1],
			['9 Birch Row', 2, null, null],
			['2 Cedar Row', 3, 2.5, -0.5]
		]);
		// 4 + 3 = 7 expected against 5 + 2.5 = 7.5 recorded: +0.5 h, +7.14…%.
		expect(r.total).toEqual({
			jobs: 2,
			hoursExpected: 7,
			hoursLogged: 7.5,
			difference: 0.5,
			differencePct: (0.5 / 7) * 100
		});
	});
});

describe('report tables', () => {
	it('carry the same figures, with a total row that adds up', () => {
		const t = reportTables({
			estimates: [N1, N2, D1, S1],
			proposals: [],
			jobs: JOBS,
			suggestions: []
		});
		expect(t['revenue-by-month'].total).toEqual([
			'All',
			3,
			230_000,
			115_600,
			114_400,
			(114_400 / 230_000) * 100
		]);
		expect(t.pipeline.total).toEqual(['All', 4, 0]);
		expect(t['crew-hours'].rows).toHaveLength(3);
		expect(csvFigure(255_045, 'money')).toBe('2550.45');
		expect(csvFigure(56_000 / 22, 'money')).toBe('25.45');
		expect(csvFigure(7.1428571, 'pct')).toBe(7.14);
	});

	it('is empty, not failing, for a company with no data', () => {
		const t = reportTables({ estimates: [], proposals: [], jobs: [], suggestions: [] });
		for (const id of [
			'win-rate',
			'revenue-by-month',
			'revenue-by-material',
			'chemical',
			'price-per-square',
			'crew-hours'
		] as const)
			expect(t[id].rows).toEqual([]);
		expect(t.pipeline.rows.every((r) => r[1] === 0)).toBe(true);
	});

	it('months are UTC calendar months', () => {
		expect(monthOf('2026-11-30T23:59:59Z')).toBe('2026-11');
		expect(monthOf('2026-12-01')).toBe('2026-12');
	});
});
