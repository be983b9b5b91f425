import { minutesOf } from './week';

/** What the conflict check needs of a job. */
export interface PlannedJob {
	id: string;
	date: string | null;
	windowStart: string;
	expectedHours: number;
	crewIds: readonly string[];
}

export type Conflict =
	| { kind: 'double-booked'; memberId: string; date: string; jobIds: [string, string] }
	| {
			kind: 'over-hours';
			memberId: string;
			date: string;
			hours: number;
			limit: number;
			jobIds: string[];
	  };

/**
 * Where a crew member is booked twice at once, or for more hours in a day than the limit.
 * A job occupies its member from the start of its arrival window for its expected hours: the
 * crew is committed from the moment it may arrive (common practice, no outside source). Jobs
 * without a date (postponed, waiting) take no time. Touching ends (one ends at 12:00, the next
 * starts at 12:00) are not a conflict.
 */
export function findConflicts(jobs: readonly PlannedJob[], dayHoursLimit: number): Conflict[] {
	const byMemberDay = new Map<string, PlannedJob[]>();
	for (const j of jobs) {
		if (j.date === null) continue;
		for (const m of new Set(j.crewIds)) {
			const key = `${m}|${j.date}`;
			const list = byMemberDay.get(key) ?? [];
			list.push(j);
			byMemberDay.set(key, list);
		}
	}
	const out: Conflict[] = [];
	for (const [key, list] of byMemberDay) {
		const [memberId, date] = key.split('|');
		const spans = list
			.map((j) => {
				const start = minutesOf(j.windowStart);
				return { j, start, end: start + j.expectedHours * 60 };
			})
			.sort((a, b) => a.start - b.start || a.j.id.localeCompare(b.j.id));
		for (let i = 0; i < spans.length; i++) {
			for (let k = i + 1; k < spans.length && spans[k].start < spans[i].end; k++) {
				out.push({
					kind: 'double-booked',
					memberId,
					date,
					jobIds: [spans[i].j.id, spans[k].j.id]
				});
			}
		}
		const hours = list.reduce((s, j) => s + j.expectedHours, 0);
		// A hair of slack so 8.000000001 h of summed floats is not "over 8".
		if (hours > dayHoursLimit + 1e-9) {
			out.push({
				kind: 'over-hours',
				memberId,
				date,
				hours,
				limit: dayHoursLimit,
				jobIds: spans.map((s) => s.j.id)
			});
		}
	}
	return out.sort(
		(a, b) =>
			a.date.localeCompare(b.date) ||
			a.memberId.localeCompare(b.memberId) ||
			a.kind.localeCompare(b.kind)
	);
}

/** The conflicts a job is part of. */
export function conflictsOf(jobId: string, conflicts: readonly Conflict[]): Conflict[] {
	return conflicts.filter((c) => (c.jobIds as readonly string[]).includes(jobId));
}

/** Crew hours one member works in a day before the week view flags it (common practice). */
export const WORKDAY_HOURS = 8;
