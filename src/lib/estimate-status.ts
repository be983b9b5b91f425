import type { Role } from './roles';

/**
 * An estimate's statuses in the order it normally moves, then the two ends. One list for the
 * database enum, the API's schemas and the screens.
 */
export const ESTIMATE_STATUSES = [
	'draft',
	'ready',
	'sent',
	'accepted',
	'scheduled',
	'done',
	'paid',
	'declined',
	'expired'
] as const;

export type EstimateStatus = (typeof ESTIMATE_STATUSES)[number];

/**
 * The moves an estimate can make and who may make them. The owner may make any of them; the
 * estimator readies a draft; sales sends, and records the customer's answer; the crew closes
 * the job it worked. Three moves carry data of their own and are made only where that data is
 * entered (JOB_MOVES): scheduling (date, window, crew), done (the crew's log) and paid (the final
 * invoice's payment).
 */
const TRANSITIONS: Record<EstimateStatus, Partial<Record<EstimateStatus, readonly Role[]>>> = {
	draft: { ready: ['owner', 'estimator'] },
	ready: { sent: ['owner', 'sales'], draft: ['owner', 'estimator'], expired: ['owner', 'sales'] },
	sent: {
		accepted: ['owner', 'sales'],
		declined: ['owner', 'sales'],
		expired: ['owner', 'sales']
	},
	accepted: { scheduled: ['owner', 'sales'] },
	scheduled: { done: ['owner', 'crew'] },
	done: { paid: ['owner'] },
	paid: {},
	declined: {},
	expired: {}
};

/** Statuses reachable from `from`, whoever asks. */
export function legalNext(from: EstimateStatus): EstimateStatus[] {
	return Object.keys(TRANSITIONS[from]) as EstimateStatus[];
}

/** Statuses this role may move an estimate to from `from`. */
export function nextStatusesFor(from: EstimateStatus, role: Role): EstimateStatus[] {
	return legalNext(from).filter((to) => TRANSITIONS[from][to]!.includes(role));
}

/** The roles that may move an estimate from `from` to `to`; undefined when the move is not legal. */
export function rolesForMove(
	from: EstimateStatus,
	to: EstimateStatus
): readonly Role[] | undefined {
	return TRANSITIONS[from][to];
}

/** Moves made by scheduling and by the crew sheet, never by a bare status change. */
export const JOB_MOVES: Partial<Record<EstimateStatus, string>> = {
	scheduled: 'Schedule it on the Schedule page: it needs a date, a window and a crew.',
	done: 'Mark it done on its crew sheet: it needs the checklist and an after photo, or a reason.',
	paid: 'It is paid when its final invoice is: by card through the pay link, or as cash or a cheque the owner records on the estimate.'
};
