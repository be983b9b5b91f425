// The owner's audit page against the built server: changes made through the app's own forms show
// up there, the GET form's filters (who, kind, days) narrow the rows, pages link to each other,
// a bad filter is named and left out, and no other role may open it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sessionFor } from '../helpers/http';
import { seededDataDir, startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let owner: string;
let ownerId: string;

const tomorrow = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
const today = new Date().toISOString().slice(0, 10);

async function form(path: string, fields: Record<string, string>) {
	const r = await fetch(server.url + path, {
		method: 'POST',
		redirect: 'manual',
		headers: {
			cookie: owner,
			origin: server.url,
			'content-type': 'application/x-www-form-urlencoded'
		},
		body: new URLSearchParams(fields).toString()
	});
	if (r.status !== 200) throw new Error(`${path}: ${r.status} ${await r.text()}`);
}

async function page(search = '', cookie = owner) {
	const r = await fetch(`${server.url}/audit${search}`, {
		headers: { cookie },
		redirect: 'manual'
	});
	return { status: r.status, location: r.headers.get('location'), html: await r.text() };
}

/** The summaries of the rows the page shows, in its order. */
const summaries = (html: string) =>
	[...html.matchAll(/data-testid="audit-row"[\s\S]*?<span>([^<]*)<\/span>/g)].map((m) => m[1]);

beforeAll(async () => {
	server = await startServer(seededDataDir('audit-page'));
	owner = await sessionFor(server.url, 'owner');
	ownerId = (await (await fetch(`${server.url}/api/me`, { headers: { cookie: owner } })).json()).id;
	await form('/team?/invite', {
		name: 'Tamsin Orrow',
		email: 'tamsin.orrow@harborpine.example',
		role: 'crew',
		password: 'long-enough-passphrase-2026'
	});
	// 55 saves of the company's phone: more rows than one page holds.
	for (let i = 0; i < 55; i++) {
		await form('/settings?/contact', {
			phone: `555-01${String(i).padStart(2, '0')}`,
			email: '',
			postalAddress: '',
			licence: ''
		});
	}
});
afterAll(async () => {
	await server?.stop();
});

describe('/audit', () => {
	it('is the owner’s only', async () => {
		for (const role of ['estimator', 'sales', 'crew'] as const) {
			expect((await page('', await sessionFor(server.url, role))).status, role).toBe(403);
		}
		const anonymous = await page('', '');
		expect(anonymous.status).toBe(303);
		expect(anonymous.location).toMatch(/^\/sign-in\?next=%2Faudit/);
	});

	it('shows the changes made through the forms, newest first, fifty to a page', async () => {
		const first = await page();
		expect(first.status).toBe(200);
		const rows = summaries(first.html);
		expect(rows).toHaveLength(50);
		expect(rows[0]).toBe('Changed the company details: phone');
		expect(first.html).toMatch(/1–50 of 56/);
		expect(first.html).toContain('href="/audit?page=2"');
		const second = await page('?page=2');
		expect(summaries(second.html).at(-1)).toBe(
			'Invited Tamsin Orrow (tamsin.orrow@harborpine.example) as crew'
		);
		expect(second.html).toMatch(/51–56 of 56/);
		// A page past the end goes to the last one.
		const past = await page('?page=9');
		expect(past.status).toBe(303);
		expect(past.location).toBe('/audit?page=2');
	});

	it('filters by kind, by who and by days', async () => {
		const team = summaries((await page('?kind=team')).html);
		expect(team).toEqual(['Invited Tamsin Orrow (tamsin.orrow@harborpine.example) as crew']);
		expect((await page('?kind=company')).html).toMatch(/1–50 of 55/);
		expect((await page('?kind=rate-card')).html).toContain('No changes match');
		expect((await page(`?actor=${ownerId}&kind=team`)).html).toContain('Tamsin Orrow');
		// Changes without an account (the customer, the payment service): none here.
		expect((await page('?actor=none')).html).toContain('No changes match');
		expect((await page(`?from=${today}&to=${today}`)).html).toMatch(/of 56/);
		expect((await page(`?from=${tomorrow}`)).html).toContain('No changes match');
		// The page links keep the filters.
		expect((await page('?kind=company')).html).toContain('href="/audit?kind=company&amp;page=2"');
	});

	it('names a filter it cannot read and shows more rather than failing', async () => {
		const bad = await page('?kind=payroll&from=yesterday');
		expect(bad.status).toBe(200);
		expect(bad.html).toContain('The kind of change and first day in this link could not be read');
		expect(bad.html).toMatch(/of 56/);
		const backwards = await page(`?from=${tomorrow}&to=${today}`);
		expect(backwards.html).toContain('date range (it ends before it starts)');
		expect(backwards.html).toMatch(/of 56/);
	});

	it('has no way to change a row: no form action answers', async () => {
		const r = await fetch(`${server.url}/audit`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				cookie: owner,
				origin: server.url,
				'content-type': 'application/x-www-form-urlencoded'
			},
			body: 'summary=edited'
		});
		expect(r.status).toBe(405);
		expect(summaries((await page()).html)).not.toContain('edited');
		expect((await page()).html).toMatch(/of 56/);
	});
});
