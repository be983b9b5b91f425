import { createHash, randomBytes } from 'node:crypto';

/** 160 random bits for an API token; only its SHA-256 is stored. */
export function newApiToken(): string {
	return 'cp_' + randomBytes(20).toString('base64url');
}

export function hashApiToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

/** Session tokens: 160 random bits in the cookie, SHA-256 of it as the stored session id. */
export function newSessionToken(): string {
	return randomBytes(20).toString('base64url');
}

export function hashSessionToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}
