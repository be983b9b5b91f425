// Calendar helpers for the week view. Weeks start on Monday as ISO 8601 numbers them; the
// check dates are fixed calendar facts: 1 January 2024 was a Monday, 3 December 2026 is a
// Thursday, and the Gregorian leap-year rule (divisible by 4, centuries only by 400) makes
// 2000-02-29 a date and 2100-02-29 not one.
import { describe, expect, it } from 'vitest';
import {
	addDays,
	isHm,
	isIsoDate,
	longDay,
	minutesOf,
	shortDay,
	weekDays,
	weekStart
} from '../../../src/lib/jobs/week';

describe('week helpers', () => {
	it('starts a week on Monday (ISO 8601)', () => {
		expect(weekStart('2024-01-01')).toBe('2024-01-01'); // a Monday
		expect(weekStart('2024-01-07')).toBe('2024-01-01'); // the Sunday after
		expect(weekStart('2026-12-03')).toBe('2026-11-30'); // Thursday → Monday 30 Nov
		expect(weekDays('2026-11-30')).toEqual([
			'2026-11-30',
			'2026-12-01',
			'2026-12-02',
			'2026-12-03',
			'2026-12-04',
			'2026-12-05',
			'2026-12-06'
		]);
	});

	it('adds days across months and leap days', () => {
		expect(addDays('2024-02-28', 1)).toBe('2024-02-29');
		expect(addDays('2023-02-28', 1)).toBe('2023-03-01');
		expect(addDays('2026-01-01', -1)).toBe('2025-12-31');
	});

	it('accepts only real dates', () => {
		expect(isIsoDate('2000-02-29')).toBe(true);
		expect(isIsoDate('2100-02-29')).toBe(false);
		for (const bad of [
			'2026-13-01',
			'2026-00-10',
			'2026-1-1',
			'26-01-01',
			'',
			'today',
			'2026-02-30'
		])
			expect(isIsoDate(bad), bad).toBe(false);
	});

	it('reads 24-hour times', () => {
		expect(minutesOf('00:00')).toBe(0);
		expect(minutesOf('08:30')).toBe(510);
		expect(minutesOf('23:59')).toBe(1439);
		for (const bad of ['24:00', '8:30', '08:60', '08-30', '']) expect(isHm(bad), bad).toBe(false);
	});

	it('names days for the screens and the e-mail', () => {
		expect(shortDay('2026-12-03')).toBe('Thu 3 Dec');
		expect(longDay('2026-12-03')).toBe('Thursday, December 3, 2026');
	});
});
