// The proposal e-mail builder and the outbox's retry spacing: pure functions, no server.
import { describe, expect, it } from 'vitest';
import { buildProposalEmail, escapeHtml, retryDelayMs } from '$lib/server/mail';

// Invented demo values (PRODUCT.md's Harbor & Pine scenario, town of Wrenfield).
const base = {
	companyName: 'Harbor & Pine Exterior Care',
	companyPhone: '(555) 010-2040',
	companyEmail: 'office@harborpine.example',
	customerName: 'Marisol Quenby',
	siteAddress: '14 Tidewater Lane, Wrenfield',
	proposalVersion: 2,
	totalCents: 128_450,
	depositCents: 32_113,
	validUntil: '2026-06-30',
	link: 'https://app.harborpine.example/p/Zk3w9x_long-random-token'
};

describe('buildProposalEmail', () => {
	it('has a text and an HTML part with the price, deposit, validity and private link', () => {
		const m = buildProposalEmail(base);
		expect(m.subject).toBe(
			'Your roof cleaning proposal from Harbor & Pine Exterior Care — 14 Tidewater Lane, Wrenfield'
		);
		expect(m.text).toContain('Price: $1,284.50');
		expect(m.text).toContain('Deposit to book: $321.13');
		expect(m.text).toContain('Good until: June 30, 2026');
		expect(m.text).toContain(base.link);
		expect(m.text).not.toMatch(/<[a-z]/i);
		expect(m.html).toContain(`href="${base.link}"`);
		// "&" in the company name is escaped in HTML, left alone in text.
		expect(m.html).toContain('Harbor &amp; Pine Exterior Care');
		expect(m.text).toContain('Harbor & Pine Exterior Care');
	});

	it('escapes every user value in the HTML part', () => {
		const m = buildProposalEmail({
			...base,
			customerName: '<script>alert("x")</script>',
			siteAddress: `1 "Quote" Rd' onmouseover='x`,
			salespersonName: '<img src=x onerror=alert(1)>'
		});
		expect(m.html).not.toContain('<script>');
		expect(m.html).not.toContain('<img');
		expect(m.html).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;');
		expect(m.html).toContain('1 &quot;Quote&quot; Rd&#39; onmouseover=&#39;x');
	});

	it('keeps the subject on one line and refuses a link that is not http(s)', () => {
		const m = buildProposalEmail({
			...base,
			siteAddress: '9 Fern Ct\r\nBcc: someone@else.example'
		});
		expect(m.subject).not.toMatch(/[\r\n]/);
		expect(() => buildProposalEmail({ ...base, link: 'javascript:alert(1)' })).toThrow(/http/);
		expect(() => buildProposalEmail({ ...base, validUntil: '30/06/2026' })).toThrow(/date/);
	});
});

describe('escapeHtml', () => {
	// The five characters of OWASP's XSS Prevention Cheat Sheet, rule #1 (HTML entity encoding).
	it('encodes & < > " and \'', () => {
		expect(escapeHtml(`&<>"'`)).toBe('&amp;&lt;&gt;&quot;&#39;');
		expect(escapeHtml('plain')).toBe('plain');
		expect(escapeHtml(null)).toBe('');
	});
});

describe('retryDelayMs', () => {
	it('doubles from one minute and stops at an hour', () => {
		expect([1, 2, 3, 4, 5, 6, 7, 8].map((n) => retryDelayMs(n) / 60_000)).toEqual([
			1, 2, 4, 8, 16, 32, 60, 60
		]);
		expect(retryDelayMs(1000)).toBe(60 * 60_000);
		expect(() => retryDelayMs(0)).toThrow(RangeError);
	});
});
