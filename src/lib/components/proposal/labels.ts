import type { ProposalStatus } from '$lib/proposal/status';

export const PROPOSAL_STATUS_LABELS: Record<ProposalStatus, string> = {
	open: 'With the customer',
	accepted: 'Accepted',
	declined: 'Declined',
	revoked: 'Link withdrawn',
	superseded: 'Replaced by a newer version'
};

export const MAIL_STATUS_LABELS: Record<string, string> = {
	queued: 'Waiting to send',
	sending: 'Sending',
	sent: 'Delivered to the mail server',
	failed: 'Not delivered yet, will retry',
	dead: 'Refused, needs attention'
};

export const DEPOSIT_LABELS = {
	none: 'Deposit not started',
	open: 'Deposit started, not paid',
	cancelled: 'Deposit cancelled, not paid',
	paid: 'Deposit paid'
} as const;
