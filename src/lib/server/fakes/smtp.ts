// A local SMTP server for the demo and the tests (never for production): it accepts every
// message on 127.0.0.1, parses it with mailparser, keeps it in memory and in a JSON file, and
// shows it over a small HTTP endpoint for the Outbox page. It can be told to refuse mail.
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';

export type FakeMail = {
	id: string;
	receivedAt: string;
	envelope: { from: string | null; to: string[] };
	messageId: string | null;
	from: string | null;
	to: string[];
	subject: string | null;
	text: string | null;
	html: string | null;
	headers: Record<string, string>;
};

/** "temporary" answers 451 (try again later), "permanent" 550 (RFC 5321 §4.2.2 reply codes). */
export type RefuseMode = 'temporary' | 'permanent' | null;

export type SmtpFake = {
	/** smtp://127.0.0.1:PORT, for CLEARPITCH_SMTP_URL. */
	url: string;
	port: number;
	/** http://127.0.0.1:PORT/messages, for CLEARPITCH_MAIL_FAKE_INBOX_URL. */
	inboxUrl: string;
	messages(): FakeMail[];
	refuse(mode: RefuseMode): void;
	clear(): void;
	close(): Promise<void>;
};

export async function startSmtpFake(
	opts: {
		port?: number;
		httpPort?: number;
		/** The JSON file kept beside the app's data; none when omitted. */
		storeFile?: string;
	} = {}
): Promise<SmtpFake> {
	const host = '127.0.0.1';
	let mode: RefuseMode = null;
	const received: FakeMail[] = opts.storeFile ? load(opts.storeFile) : [];
	const save = () => {
		if (!opts.storeFile) return;
		fs.mkdirSync(path.dirname(opts.storeFile), { recursive: true });
		const tmp = `${opts.storeFile}.${process.pid}.tmp`;
		fs.writeFileSync(tmp, JSON.stringify(received, null, 1));
		fs.renameSync(tmp, opts.storeFile);
	};

	const refusal = () => {
		if (!mode) return null;
		const err = new Error(
			mode === 'temporary'
				? 'Local fake: mailbox busy, try again later'
				: 'Local fake: mailbox unavailable'
		) as Error & { responseCode: number };
		err.responseCode = mode === 'temporary' ? 451 : 550;
		return err;
	};

	const smtp = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS', 'AUTH'],
		banner: 'Clearpitch local mail fake',
		size: 25 * 1024 * 1024,
		logger: false,
		onRcptTo(_address, _session, cb) {
			cb(refusal());
		},
		onData(stream, session, cb) {
			simpleParser(stream)
				.then((m) => {
					const headers: Record<string, string> = {};
					for (const [k, v] of m.headers) {
						if (typeof v === 'string') headers[k] = v;
					}
					received.push({
						id: randomUUID(),
						receivedAt: new Date().toISOString(),
						envelope: {
							from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
							to: session.envelope.rcptTo.map((r) => r.address)
						},
						messageId: m.messageId ?? null,
						from: m.from?.text ?? null,
						to: addresses(m.to),
						subject: m.subject ?? null,
						text: m.text ?? null,
						html: typeof m.html === 'string' ? m.html : null,
						headers
					});
					save();
					cb();
				})
				.catch((e: Error) => cb(e));
		}
	});
	await new Promise<void>((resolve, reject) => {
		smtp.once('error', reject);
		smtp.listen(opts.port ?? 0, host, () => resolve());
	});
	smtp.on('error', (e) => console.error('SMTP fake:', e.message));
	const port = (smtp.server.address() as AddressInfo).port;

	const web = http.createServer((req, res) => {
		const url = new URL(req.url ?? '/', 'http://x');
		const json = (status: number, body: unknown) => {
			res.writeHead(status, { 'content-type': 'application/json' });
			res.end(JSON.stringify(body));
		};
		if (url.pathname === '/messages' && req.method === 'GET') return json(200, received);
		if (url.pathname === '/messages' && req.method === 'DELETE') {
			received.length = 0;
			save();
			return json(200, { ok: true });
		}
		if (url.pathname === '/refuse' && req.method === 'POST') {
			const m = url.searchParams.get('mode');
			mode = m === 'temporary' || m === 'permanent' ? m : null;
			return json(200, { mode });
		}
		json(404, { message: 'Not found' });
	});
	await new Promise<void>((resolve, reject) => {
		web.once('error', reject);
		web.listen(opts.httpPort ?? 0, host, () => resolve());
	});
	const httpPort = (web.address() as AddressInfo).port;

	return {
		url: `smtp://${host}:${port}`,
		port,
		inboxUrl: `http://${host}:${httpPort}/messages`,
		messages: () => [...received],
		refuse: (m) => {
			mode = m;
		},
		clear: () => {
			received.length = 0;
			save();
		},
		close: async () => {
			web.closeAllConnections();
			await Promise.all([
				new Promise<void>((r) => smtp.close(() => r())),
				new Promise<void>((r) => web.close(() => r()))
			]);
		}
	};
}

function addresses(a: AddressObject | AddressObject[] | undefined): string[] {
	if (!a) return [];
	return (Array.isArray(a) ? a : [a]).flatMap((o) => o.value.map((v) => v.address ?? ''));
}

function load(file: string): FakeMail[] {
	try {
		const data = JSON.parse(fs.readFileSync(file, 'utf8'));
		return Array.isArray(data) ? data : [];
	} catch {
		return [];
	}
}
