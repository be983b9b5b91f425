// The customer's e-mail for each change to a visit: escaped HTML (OWASP XSS Prevention Cheat
// Sheet, rules 1–2: encode &, <, >, ", ' in HTML text and quoted attributes), one-line subject
// (RFC 5322 §2.2: a header field is one line unless folded; a raw CR/LF would start a new one),
// and the preparation list the crew relies on (common practice, no outside source).
import { describe, expect, it } from 'vitest';
import { buildJobEmail } from '../../../src/lib/server/mail/job-email';

const base = {
	kind: 'scheduled' as const,
	companyName: 'Harbor & Pine Exterior Care',
	customerName: 'Rosalind <b>Okonkwo</b>',
	siteAddress: '7 Saltmarsh Court, Wrenfield\r\nBcc: someone@else.example',
	date: '2026-12-03',
	windowStart: '08:00',
	windowEnd: '10:00',
	notes: { gate: true, pets: false, water: false }
};

describe('buildJobEmail', () => {
	it('gives the date, window and what to do before the crew arrives', () => {
		const m = buildJobEmail(base);
		expect(m.text).toContain('Thursday, December 3, 2026, arriving between 08:00 and 10:00');
		expect(m.text).toContain('Close windows, doors and vents');
		expect(m.text).toContain('Leave the gate as agreed');
		expect(m.html).toContain('<li>Move cars, bikes');
	});

	it('escapes every user value in the HTML and keeps the subject on one line', () => {
		const m = buildJobEmail(base);
		expect(m.html).not.toContain('<b>Okonkwo</b>');
		expect(m.html).toContain('Rosalind &lt;b&gt;Okonkwo&lt;/b&gt;');
		expect(m.html).toContain('Harbor &amp; Pine');
		expect(m.subject).not.toMatch(/[\r\n]/);
	});

	it('says why a visit is postponed, and leaves out the preparation list without a date', () => {
		const m = buildJobEmail({
			...base,
			kind: 'postponed',
			date: null,
			reason: 'Rain <all> morning'
		});
		expect(m.subject).toMatch(/postponed/);
		expect(m.text).toContain('We will be in touch with a new date.');
		expect(m.text).toContain('Why: Rain <all> morning');
		expect(m.html).toContain('Why: Rain &lt;all&gt; morning');
		expect(m.text).not.toContain('Before the crew arrives');
	});

	it('names the new date of a move', () => {
		const m = buildJobEmail({ ...base, kind: 'moved', date: '2026-12-07' });
		expect(m.text).toContain('moved your roof cleaning');
		expect(m.text).toContain('Monday, December 7, 2026');
	});
});
