import { createHash, randomBytes } from 'node:crypto';

/**
 * The customer's private link: 256 random bits, base64url (43 characters). Whoever holds it can
 * open the proposal, so only its SHA-256 is stored, as with session and API tokens.
 */
export function newProposalToken(): string {
	return randomBytes(32).toString('base64url');
}

export function hashProposalToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

/** The shape of a token we could have made; anything else is not looked up at all. */
export const PROPOSAL_TOKEN = /^[A-Za-z0-9_-]{43}$/;
