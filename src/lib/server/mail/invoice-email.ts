import { formatCents } from '../../estimating/money';
import type { BuiltEmail } from './proposal-email';
import { escapeHtml, oneLine } from './html';

export type InvoiceEmailInput = {
	companyName: string;
	companyPhone?: string | null;
	customerName: string;
	siteAddress: string;
	number: number;
	totalCents: number;
	/** The private pay link (`/i/<token>`). */
	link: string;
};

/** The final invoice's e-mail: what is owed, and the private link to see and pay it. */
export function buildInvoiceEmail(p: InvoiceEmailInput): BuiltEmail {
	const amount = formatCents(p.totalCents);
	const subject = oneLine(`Invoice ${p.number} — ${p.siteAddress} roof cleaning — ${amount}`);
	const contact = [p.companyName, p.companyPhone].filter(Boolean).join(' · ');
	const text = [
		`Hello ${p.customerName},`,
		'',
		`The crew has finished the roof cleaning at ${p.siteAddress}. Thank you for having us.`,
		`Invoice ${p.number} is for the balance of ${amount}, after the deposit you paid.`,
		'',
		'See the invoice and pay it by card here:',
		p.link,
		'',
		'You can also pay by cash or cheque; tell us and we will record it.',
		'Keep this link to yourself: anyone who has it can see the invoice.',
		'',
		contact
	].join('\n');
	const e = escapeHtml;
	const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width">
<title>${e(subject)}</title></head>
<body style="margin:0;padding:24px;font-family:Arial,Helvetica,sans-serif;color:#1b2229;background:#ffffff">
<p>Hello ${e(p.customerName)},</p>
<p>The crew has finished the roof cleaning at ${e(p.siteAddress)}. Thank you for having us.</p>
<p><strong>Invoice ${e(p.number)} is for the balance of ${e(amount)}</strong>, after the deposit you paid.</p>
<p><a href="${e(p.link)}" style="display:inline-block;padding:12px 20px;background:#1f5f4a;color:#ffffff;text-decoration:none;border-radius:8px;font-weight:bold">See and pay the invoice</a></p>
<p style="font-size:13px;color:#47525c">Or open this link: ${e(p.link)}</p>
<p>You can also pay by cash or cheque; tell us and we will record it.</p>
<p>${e(contact)}</p>
</body></html>`;
	return { subject, text, html };
}
