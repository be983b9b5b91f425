import { env } from '../env';
import type { FakeMail } from '../fakes/smtp';

export type { FakeMail };

/**
 * What the local SMTP fake received (demo mode only, for the Outbox page); null when no fake is
 * configured (CLEARPITCH_MAIL_FAKE_INBOX_URL unset), so production never shows this page.
 */
export async function readFakeInbox(url = env.mailFakeInboxUrl): Promise<FakeMail[] | null> {
	if (!url) return null;
	const res = await fetch(url, { signal: AbortSignal.timeout(5_000) });
	if (!res.ok) throw new Error(`The local mail fake answered ${res.status}.`);
	return (await res.json()) as FakeMail[];
}
