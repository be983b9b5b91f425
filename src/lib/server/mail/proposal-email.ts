import { formatCents } from '../../estimating/money';
import { escapeHtml, oneLine } from './html';

export type ProposalEmailInput = {
	companyName: string;
	companyPhone?: string | null;
	companyEmail?: string | null;
	customerName: string;
	siteAddress: string;
	proposalVersion: number;
	totalCents: number;
	depositCents: number;
	/** ISO date (YYYY-MM-DD) the proposal is good until. */
	validUntil: string;
	/** The customer's private link (long random token); whoever has it can open the proposal. */
	link: string;
	salespersonName?: string | null;
};

export type BuiltEmail = { subject: string; text: string; html: string };

/**
 * The proposal e-mail, as plain text and as HTML. Every value that comes from a user is
 * escaped in the HTML; the link must be an http(s) URL.
 */
export function buildProposalEmail(p: ProposalEmailInput): BuiltEmail {
	const link = new URL(p.link);
	if (link.protocol !== 'https:' && link.protocol !== 'http:') {
		throw new Error('The proposal link must be an http(s) address.');
	}
	const href = link.toString();
	const valid = longDate(p.validUntil);
	const total = formatCents(p.totalCents);
	const deposit = formatCents(p.depositCents);
	const from = p.salespersonName ? `${p.salespersonName}, ${p.companyName}` : p.companyName;
	const contact = [p.companyPhone, p.companyEmail].filter(Boolean).join(' · ');
	const subject = oneLine(`Your roof cleaning proposal from ${p.companyName} — ${p.siteAddress}`);

	const text = [
		`Hello ${p.customerName},`,
		'',
		`Thank you for having us out to ${p.siteAddress}. Your proposal (version ${p.proposalVersion}) is ready:`,
		'',
		`  Price: ${total}`,
		`  Deposit to book: ${deposit}`,
		`  Good until: ${valid}`,
		'',
		'Open it here to read the scope, choose any extras, and accept:',
		href,
		'',
		'This link is private to you; please do not forward it.',
		'',
		from,
		contact
	]
		.filter((line, i, all) => !(line === '' && all[i - 1] === ''))
		.join('\n')
		.trimEnd();

	const e = escapeHtml;
	const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width">
<title>${e(subject)}</title></head>
<body style="margin:0;padding:24px;font-family:Arial,Helvetica,sans-serif;color:#1f2937;background:#ffffff">
<p>Hello ${e(p.customerName)},</p>
<p>Thank you for having us out to ${e(p.siteAddress)}. Your proposal (version ${e(p.proposalVersion)}) is ready.</p>
<table role="presentation" style="border-collapse:collapse;margin:16px 0">
<tr><td style="padding:4px 16px 4px 0">Price</td><td style="padding:4px 0"><strong>${e(total)}</strong></td></tr>
<tr><td style="padding:4px 16px 4px 0">Deposit to book</td><td style="padding:4px 0">${e(deposit)}</td></tr>
<tr><td style="padding:4px 16px 4px 0">Good until</td><td style="padding:4px 0">${e(valid)}</td></tr>
</table>
<p><a href="${e(href)}" style="display:inline-block;padding:12px 20px;background:#1d4ed8;color:#ffffff;text-decoration:none;border-radius:6px">Open your proposal</a></p>
<p style="font-size:13px;color:#4b5563">Or paste this address into your browser: ${e(href)}<br>This link is private to you; please do not forward it.</p>
<p>${e(from)}${contact ? `<br>${e(contact)}` : ''}</p>
</body></html>`;
	return { subject, text, html };
}

const MONTHS = [
	'January',
	'February',
	'March',
	'April',
	'May',
	'June',
	'July',
	'August',
	'September',
	'October',
	'November',
	'December'
];

function longDate(iso: string): string {
	const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(iso);
	if (!m || Number(m[2]) < 1 || Number(m[2]) > 12) throw new Error(`Not a date: ${iso}`);
	return `${MONTHS[Number(m[2]) - 1]} ${Number(m[3])}, ${m[1]}`;
}
