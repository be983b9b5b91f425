/** How the outbox spaces its retries: doubling from a first wait, capped, then given up. */
export type RetryPolicy = { firstDelayMs: number; maxDelayMs: number; maxAttempts: number };

// 1 min, 2, 4, 8 … capped at 1 h; after 12 tries (about 9 hours in all) the message is "dead",
// which shows on the estimate for someone to act on; it is never dropped.
export const DEFAULT_RETRY: RetryPolicy = {
	firstDelayMs: 60_000,
	maxDelayMs: 60 * 60_000,
	maxAttempts: 12
};

/** The wait after the given failed attempt (1 = the first try failed). */
export function retryDelayMs(failedAttempts: number, policy: RetryPolicy = DEFAULT_RETRY): number {
	if (!Number.isInteger(failedAttempts) || failedAttempts < 1) {
		throw new RangeError(`failedAttempts must be a whole number ≥ 1 (got ${failedAttempts})`);
	}
	const doubled = policy.firstDelayMs * 2 ** Math.min(failedAttempts - 1, 40);
	return Math.min(doubled, policy.maxDelayMs);
}
