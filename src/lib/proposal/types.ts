/** A proposal as the customer reads it; frozen in `proposals.snapshot` when it is sent. */
import type { ProposalStatus } from './status';

/** One facet of the scope, in plain words, named by its label (never an internal id). */
export type ScopeLine = { facet: string; text: string };

/** An extra the customer may tick, with its price as offered (pre-tax, integer cents). */
export type OfferedExtra = { code: string; label: string; detail: string; priceCents: number };

/** An extra the customer ticked, with the price it was accepted at. */
export type TickedExtra = { code: string; label: string; priceCents: number };

export type PriceLine = { label: string; amountCents: number };

export type ProposalSnapshot = {
	company: {
		name: string;
		phone: string | null;
		email: string | null;
		address: string | null;
		licence: string | null;
	};
	customerName: string;
	siteAddress: string;
	salesperson: string | null;
	scope: ScopeLine[];
	totals: { squares: number; facets: number };
	/** The estimate's price lines; they add up to `totalCents`. */
	priceLines: PriceLine[];
	totalCents: number;
	depositCents: number;
	depositPct: number;
	taxPct: number;
	included: string[];
	extras: OfferedExtra[];
	/** The model's expectations notes, with the facets they are about named by label. */
	expectations: string[];
	validUntil: string;
	issuedOn: string;
	version: number;
	/** Site-visit photos the salesperson marked for the customer (absent in older versions). */
	photos?: { id: string; caption: string }[];
};

/** The office's view of one sent version. */
export type DepositState =
	| { state: 'none' }
	| { state: 'open'; amountCents: number }
	| { state: 'cancelled'; amountCents: number }
	| { state: 'paid'; amountCents: number; paidAt: Date };

export type ProposalVersion = {
	id: string;
	version: number;
	status: ProposalStatus;
	expired: boolean;
	validUntil: string;
	recipientEmail: string;
	totalCents: number;
	depositCents: number;
	sentAt: Date;
	revokedAt: Date | null;
	answer: PublicAnswer | null;
	mail: {
		id: string;
		status: 'queued' | 'sending' | 'sent' | 'failed' | 'dead';
		attempts: number;
		lastError: string | null;
		nextAttemptAt: Date;
		sentAt: Date | null;
	}[];
	deposit: DepositState;
};

export type PublicAnswer = {
	decision: 'accepted' | 'declined';
	fullName: string | null;
	extras: TickedExtra[];
	declineReason: string | null;
	answeredAt: Date;
	ipAddress: string | null;
	proposalVersion: number;
	totalCents: number;
	depositCents: number;
};
