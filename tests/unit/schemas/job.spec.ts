// Every input of scheduling and the crew log can be wrong: the schemas refuse with a field
// message. Cases are hand-picked hostile values; the limits are Clearpitch's own.
import { describe, expect, it } from 'vitest';
import {
	jobLogSchema,
	moveSchema,
	postponeSchema,
	scheduleSchema
} from '../../../src/lib/schemas/job';

const ID = '3f0c6a8e-5b2d-4c1e-9a7f-1d2e3f4a5b6c';
const ok = {
	estimateId: ID,
	date: '2026-12-03',
	windowStart: '08:00',
	windowEnd: '10:00',
	crewIds: [ID]
};

const pathsOf = (r: { success: boolean; error?: { issues: { path: PropertyKey[] }[] } }) =>
	r.success ? [] : r.error!.issues.map((i) => i.path.join('.'));

describe('scheduleSchema', () => {
	it('takes a good schedule and drops a repeated crew member', () => {
		const r = scheduleSchema.parse({ ...ok, crewIds: [ID, ID] });
		expect(r.crewIds).toEqual([ID]);
	});

	it('refuses bad dates, times, windows and crews, by field', () => {
		expect(pathsOf(scheduleSchema.safeParse({ ...ok, date: '2026-02-30' }))).toEqual(['date']);
		expect(pathsOf(scheduleSchema.safeParse({ ...ok, windowStart: '25:00' }))).toEqual([
			'windowStart'
		]);
		expect(pathsOf(scheduleSchema.safeParse({ ...ok, windowEnd: '07:00' }))).toEqual(['windowEnd']);
		expect(pathsOf(scheduleSchema.safeParse({ ...ok, windowEnd: '08:00' }))).toEqual(['windowEnd']);
		expect(pathsOf(scheduleSchema.safeParse({ ...ok, crewIds: [] }))).toEqual(['crewIds']);
		expect(pathsOf(scheduleSchema.safeParse({ ...ok, crewIds: ['crew'] }))).toEqual(['crewIds.0']);
		expect(pathsOf(scheduleSchema.safeParse({ ...ok, estimateId: '1 OR 1=1' }))).toEqual([
			'estimateId'
		]);
	});
});

describe('moveSchema and postponeSchema', () => {
	it('needs the revision the form was drawn from', () => {
		const move = { ...ok, jobId: ID };
		expect(pathsOf(moveSchema.safeParse({ ...move, revision: '3' }))).toEqual([]);
		for (const bad of ['0', '-1', '1.5', 'NaN', '1e309', ''])
			expect(pathsOf(moveSchema.safeParse({ ...move, revision: bad })), bad).toEqual(['revision']);
	});

	it('needs a reason to postpone; the new date is optional but real', () => {
		const p = { jobId: ID, revision: '1', reason: 'Rain forecast all morning' };
		expect(postponeSchema.parse({ ...p, newDate: '' }).newDate).toBeNull();
		expect(postponeSchema.parse({ ...p, newDate: '2026-12-08' }).newDate).toBe('2026-12-08');
		expect(pathsOf(postponeSchema.safeParse({ ...p, newDate: 'soon' }))).toEqual(['newDate']);
		expect(pathsOf(postponeSchema.safeParse({ ...p, reason: 'rain' }))).toEqual(['reason']);
		expect(
			pathsOf(postponeSchema.safeParse({ ...p, reason: 'a\u0000 long enough reason' }))
		).toEqual(['reason']);
	});
});

describe('jobLogSchema', () => {
	const log = {
		checklist: { prewet: true },
		stockGalUsed: 4.5,
		surfactantOzUsed: 30,
		measuredStockPct: 11.5,
		notes: '',
		clientUpdatedAt: '2026-12-03T09:15:00.000Z'
	};

	it('takes a log, and empty amounts as null', () => {
		expect(jobLogSchema.parse(log)).toEqual(log);
		expect(
			jobLogSchema.parse({
				...log,
				stockGalUsed: null,
				surfactantOzUsed: null,
				measuredStockPct: null
			})
		).toMatchObject({ stockGalUsed: null });
	});

	it('refuses negative, absurd and non-numeric amounts, non-boolean ticks and extra keys', () => {
		expect(pathsOf(jobLogSchema.safeParse({ ...log, stockGalUsed: -1 }))).toEqual(['stockGalUsed']);
		expect(pathsOf(jobLogSchema.safeParse({ ...log, stockGalUsed: '4' }))).toEqual([
			'stockGalUsed'
		]);
		expect(pathsOf(jobLogSchema.safeParse({ ...log, surfactantOzUsed: 1e9 }))).toEqual([
			'surfactantOzUsed'
		]);
		expect(pathsOf(jobLogSchema.safeParse({ ...log, measuredStockPct: 0 }))).toEqual([
			'measuredStockPct'
		]);
		expect(pathsOf(jobLogSchema.safeParse({ ...log, checklist: { prewet: 'yes' } }))).toEqual([
			'checklist.prewet'
		]);
		expect(pathsOf(jobLogSchema.safeParse({ ...log, clientUpdatedAt: 'yesterday' }))).toEqual([
			'clientUpdatedAt'
		]);
		expect(pathsOf(jobLogSchema.safeParse({ ...log, doneReason: 'sneaky' }))).toEqual(['']);
	});
});
