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
