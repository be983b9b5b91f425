import { ESTIMATE_STATUSES, type EstimateStatus } from '$lib/estimate-status';

export type { EstimateStatus };

/** In the order an estimate normally moves, then the two ends. */
export const STATUS_ORDER: readonly EstimateStatus[] = ESTIMATE_STATUSES;

export const STATUS_LABELS: Record<EstimateStatus, string> = {
	draft: 'Draft',
	ready: 'Ready',
	sent: 'Sent',
	accepted: 'Accepted',
	scheduled: 'Scheduled',
	done: 'Done',
	paid: 'Paid',
	declined: 'Declined',
	expired: 'Expired'
};

/** The button that moves an estimate to each status. */
export const STATUS_ACTIONS: Record<EstimateStatus, string> = {
	draft: 'Back to draft',
	ready: 'Mark ready',
	sent: 'Mark sent',
	accepted: 'Customer accepted',
	scheduled: 'Mark scheduled',
	done: 'Mark done',
	paid: 'Mark paid',
	declined: 'Customer declined',
	expired: 'Mark expired'
};

export const STATUS_CLASSES: Record<EstimateStatus, string> = {
	draft: 'bg-stone-200 text-ink-700',
	ready: 'bg-pine-50 text-pine-700 ring-1 ring-pine-200',
	sent: 'bg-clay-50 text-clay-700 ring-1 ring-clay-100',
	accepted: 'bg-pine-100 text-pine-800',
	scheduled: 'bg-pine-100 text-pine-800',
	done: 'bg-pine-600 text-white',
	paid: 'bg-pine-800 text-white',
	declined: 'bg-danger-50 text-danger-700',
	expired: 'bg-amber-50 text-amber-800'
};
