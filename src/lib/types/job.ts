/** Shapes of scheduled jobs that the browser and the server share. */

export const JOB_STATUSES = ['scheduled', 'postponed', 'done', 'paid'] as const;
export type JobStatus = (typeof JOB_STATUSES)[number];

/** One change to a job's plan. Appended, never rewritten: a postponement keeps what it moved. */
export interface JobHistoryEntry {
	kind: 'scheduled' | 'moved' | 'postponed' | 'done';
	at: string;
	byName: string;
	/** The plan after this change; date null while a postponed job waits for a new one. */
	date: string | null;
	windowStart: string;
	windowEnd: string;
	crewIds: string[];
	/** The plan before this change, for moves and postponements. */
	from?: { date: string | null; windowStart: string; windowEnd: string; crewIds: string[] };
	reason?: string;
}

/** What the crew records on the day. Checklist keys come from `checklistItems()`. */
export interface JobLogState {
	checklist: Record<string, boolean>;
	stockGalUsed: number | null;
	surfactantOzUsed: number | null;
	measuredStockPct: number | null;
	notes: string;
}

export interface WeekJob {
	id: string;
	estimateId: string;
	status: JobStatus;
	date: string | null;
	windowStart: string;
	windowEnd: string;
	expectedHours: number;
	crewIds: string[];
	address: string;
	customerName: string;
	revision: number;
}

export interface CrewMember {
	id: string;
	name: string;
}

/** A done or paid job: it stays where it was, and its log no longer changes. */
export function isClosed(status: JobStatus | undefined): boolean {
	return status === 'done' || status === 'paid';
}
