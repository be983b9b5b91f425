import { longDay } from '../../jobs/week';
import type { BuiltEmail } from './proposal-email';
import { escapeHtml, oneLine } from './html';

export type JobEmailInput = {
	kind: 'scheduled' | 'moved' | 'postponed';
	companyName: string;
	companyPhone?: string | null;
	customerName: string;
	siteAddress: string;
	/** ISO date of the visit; null when a postponed visit has no new date yet. */
	date: string | null;
	windowStart: string;
	windowEnd: string;
	reason?: string | null;
	notes: { gate: boolean; pets: boolean; water: boolean };
};

/**
 * What the customer can do before the crew arrives (common practice for a soft wash; no
 * outside source): the crew protects plants and drains itself, this is what only the household
 * can do.
 */
export function prepList(notes: JobEmailInput['notes']): string[] {
	return [
		'Close windows, doors and vents, and keep them closed until the crew has finished.',
		'Move cars, bikes and anything you value at least 10 ft away from the house.',
		'Move pots, furniture and toys away from the walls, and take in laundry.',
		notes.pets
			? 'Keep pets indoors for the whole visit, as we noted on your site.'
			: 'Keep pets and children indoors while we work.',
		notes.water
			? 'Leave the outside tap we noted free to use; the crew rinses plants with it.'
			: 'Leave an outside tap free to use; the crew rinses plants with it.',
		notes.gate
			? 'Leave the gate as agreed, or tell us if the code has changed.'
			: 'Unlock side gates, or tell us how to get into the back.',
		'Tell us about fish ponds, new plantings or anything that must not get wet.'
	];
}

/** The e-mail a customer gets for each change to their visit, as text and escaped HTML. */
export function buildJobEmail(p: JobEmailInput): BuiltEmail {
	const when = p.date
		? `${longDay(p.date)}, arriving between ${p.windowStart} and ${p.windowEnd}`
		: null;
	const head =
		p.kind === 'scheduled'
			? `Your roof cleaning at ${p.siteAddress} is booked for ${when}.`
			: p.kind === 'moved'
				? `We have moved your roof cleaning at ${p.siteAddress} to ${when}.`
				: when
					? `We have to postpone your roof cleaning at ${p.siteAddress}. The new date is ${when}.`
					: `We have to postpone your roof cleaning at ${p.siteAddress}. We will be in touch with a new date.`;
	const subject = oneLine(
		p.kind === 'postponed'
			? `Your roof cleaning is postponed — ${p.siteAddress}`
			: `Your roof cleaning: ${p.date ? longDay(p.date) : ''} — ${p.siteAddress}`
	);
	const prep = prepList(p.notes);
	const reason = p.kind === 'postponed' && p.reason ? `Why: ${p.reason}` : null;
	const contact = [p.companyName, p.companyPhone].filter(Boolean).join(' · ');

	const text = [
		`Hello ${p.customerName},`,
		'',
		head,
		...(reason ? ['', reason] : []),
		...(p.date ? ['', 'Before the crew arrives, please:', ...prep.map((l) => `  - ${l}`)] : []),
		'',
		'Reply to this e-mail or call us if the date does not suit you.',
		'',
		contact
	].join('\n');

	const e = escapeHtml;
	const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width">
<title>${e(subject)}</title></head>
<body style="margin:0;padding:24px;font-family:Arial,Helvetica,sans-serif;color:#1b2229;background:#ffffff">
<p>Hello ${e(p.customerName)},</p>
<p><strong>${e(head)}</strong></p>
${reason ? `<p>${e(reason)}</p>` : ''}
${p.date ? `<p>Before the crew arrives, please:</p>\n<ul>${prep.map((l) => `<li>${e(l)}</li>`).join('')}</ul>` : ''}
<p>Reply to this e-mail or call us if the date does not suit you.</p>
<p>${e(contact)}</p>
</body></html>`;
	return { subject, text, html };
}
