import type { RequestEvent } from '@sveltejs/kit';
import { RateLimiter } from 'sveltekit-rate-limiter/server';

/**
 * Checked before any password hashing, so the hash can't be used to burn CPU.
 * Five tries a minute per client and address, and sixty a minute per client address.
 */
const limiter = new RateLimiter<string>({
	IP: [60, 'm'],
	plugins: [
		{
			rate: [5, 'm'],
			hash: (event: RequestEvent, email: string) =>
				`${event.getClientAddress()}|${email.trim().toLowerCase()}`
		}
	]
});

export function signInLimited(event: RequestEvent, email: string): Promise<boolean> {
	return limiter.isLimited(event, email);
}
