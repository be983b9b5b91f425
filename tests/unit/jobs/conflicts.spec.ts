// The week view's conflict check. What counts as a conflict is Clearpitch's own scheduling rule
// (common practice for crew calendars, no outside source): a crew member committed to two jobs
// whose time on site overlaps, or to more crew hours in a day than the working day. The cases
// are written out by hand, with the expected answers worked in the comments.
import { describe, expect, it } from 'vitest';
import { findConflicts, WORKDAY_HOURS, type PlannedJob } from '../../../src/lib/jobs/conflicts';

const A = 'a0000000-0000-4000-8000-000000000001';
const B = 'b0000000-0000-4000-8000-000000000002';

const job = (id: string, over: Partial<PlannedJob> = {}): PlannedJob => ({
	id,
	date: '2026-12-03',
	windowStart: '08:00',
	expectedHours: 2,
	crewIds: [A],
	...over
});

describe('findConflicts', () => {
	it('finds none for one job, or two jobs of different people', () => {
		expect(findConflicts([job('j1')], 8)).toEqual([]);
		expect(findConflicts([job('j1'), job('j2', { crewIds: [B] })], 8)).toEqual([]);
	});

	it('flags a member booked on two jobs whose time overlaps', () => {
		// j1 08:00–10:00 and j2 09:30–11:30 overlap by 30 min.
		const got = findConflicts([job('j1'), job('j2', { windowStart: '09:30' })], 8);
		expect(got).toEqual([
			{ kind: 'double-booked', memberId: A, date: '2026-12-03', jobIds: ['j1', 'j2'] }
		]);
	});

	it('does not flag back-to-back jobs (one ends when the next starts)', () => {
		// j1 08:00–10:00, j2 10:00–12:00.
		expect(findConflicts([job('j1'), job('j2', { windowStart: '10:00' })], 8)).toEqual([]);
	});

	it('flags each member of a shared crew who is double-booked, and only them', () => {
		const got = findConflicts(
			[job('j1', { crewIds: [A, B] }), job('j2', { windowStart: '09:00', crewIds: [B] })],
			8
		);
		expect(got.map((c) => [c.kind, c.memberId])).toEqual([['double-booked', B]]);
	});

	it('flags a day over its hours: 3 jobs of 3 h is 9 h against an 8 h day', () => {
		const jobs = [
			job('j1', { expectedHours: 3 }),
			job('j2', { windowStart: '11:00', expectedHours: 3 }),
			job('j3', { windowStart: '14:00', expectedHours: 3 })
		];
		expect(findConflicts(jobs, 8)).toEqual([
			{
				kind: 'over-hours',
				memberId: A,
				date: '2026-12-03',
				hours: 9,
				limit: 8,
				jobIds: ['j1', 'j2', 'j3']
			}
		]);
	});

	it('allows exactly the limit (4 h + 4 h = 8 h), and sums with float slack', () => {
		const jobs = [
			job('j1', { expectedHours: 4 }),
			job('j2', { windowStart: '12:00', expectedHours: 4 })
		];
		expect(findConflicts(jobs, 8)).toEqual([]);
		// 0.1 + 0.2 + … in floats is not exactly 8; the check must not flag rounding dust.
		const dust = Array.from({ length: 80 }, (_, i) =>
			job(`d${i}`, { windowStart: '00:00', expectedHours: 0.1, crewIds: [B], date: '2026-12-04' })
		);
		expect(findConflicts(dust, 8).filter((c) => c.kind === 'over-hours')).toEqual([]);
	});

	it('ignores jobs with no date (postponed) and keeps days apart', () => {
		const jobs = [
			job('j1'),
			job('j2', { date: null }),
			job('j3', { date: '2026-12-04' }),
			job('j4', { date: '2026-12-04', windowStart: '09:00' })
		];
		const got = findConflicts(jobs, 8);
		expect(got).toHaveLength(1);
		expect(got[0]).toMatchObject({
			kind: 'double-booked',
			date: '2026-12-04',
			jobIds: ['j3', 'j4']
		});
	});

	it('counts a member listed twice on one job once', () => {
		expect(findConflicts([job('j1', { crewIds: [A, A] })], 8)).toEqual([]);
	});

	it('uses an 8-hour working day by default (common practice)', () => {
		expect(WORKDAY_HOURS).toBe(8);
	});
});
