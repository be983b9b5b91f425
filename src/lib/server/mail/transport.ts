import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '../env';

export type MailTransport = Transporter;

/**
 * A nodemailer transport for an SMTP URL (CLEARPITCH_SMTP_URL by default), or null when none is
 * set: then messages wait in the outbox, marked as not sent, until one is.
 * Short timeouts so a dead server fails a try quickly and the retry loop takes over.
 */
export function createMailTransport(url: string | null = env.smtpUrl): MailTransport | null {
	if (!url) return null;
	return nodemailer.createTransport({
		url,
		connectionTimeout: 10_000,
		greetingTimeout: 10_000,
		socketTimeout: 30_000
	});
}

let shared: MailTransport | null | undefined;

/** One transport for the process (the send action and the retry loop share its pool). */
export function getMailTransport(): MailTransport | null {
	if (shared === undefined) shared = createMailTransport();
	return shared;
}
