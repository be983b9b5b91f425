/** What the audit log records, shared by the service that writes it and the page that shows it. */
export const AUDIT_KINDS = [
	'rate-card',
	'estimate',
	'team',
	'token',
	'invoice',
	'company'
] as const;
export type AuditKind = (typeof AUDIT_KINDS)[number];

export const AUDIT_KIND_LABELS: Record<AuditKind, string> = {
	'rate-card': 'Rates',
	estimate: 'Estimates and prices',
	team: 'Team',
	token: 'API tokens',
	invoice: 'Invoices and credit notes',
	company: 'Company settings'
};

/** One row as the audit page shows it. */
export type AuditRow = {
	id: string;
	at: string;
	actorName: string;
	kind: AuditKind;
	action: string;
	summary: string;
	subjectId: string | null;
	detail: Record<string, unknown>;
};
