/**
 * A proposal version's life: `open` until the customer answers (`accepted` / `declined`), sales
 * withdraws the link (`revoked`), or a changed estimate is sent again (`superseded`). Expiry is
 * not a status: it follows from the validity date, so nothing has to run at midnight.
 */
export const PROPOSAL_STATUSES = ['open', 'accepted', 'declined', 'revoked', 'superseded'] as const;
export type ProposalStatus = (typeof PROPOSAL_STATUSES)[number];

/** Past its validity date: good until the end of `validUntil` (UTC), YYYY-MM-DD. */
export function isPastValidity(validUntil: string, now = new Date()): boolean {
	return now.toISOString().slice(0, 10) > validUntil;
}
