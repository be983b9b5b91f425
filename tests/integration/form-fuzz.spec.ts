// Every form action under src/routes, fuzzed with fast-check against the built server on a fresh
// seeded PGlite, posted as the role that may use it: random and hostile bodies (missing fields,
// huge strings, wrong types, unicode, numbers out of range, extra keys, files where text belongs),
// urlencoded and multipart. No answer may be a 5xx, and a refusal (4xx) must leave what the
// action writes as it was: checked per run through read-only requests, and at the end by
// counting every table's rows with the server stopped.
import { openPglite } from '../helpers/pglite';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { planFacetsOf } from '../../geodata/scene';
import { DEFAULT_RATE_CARD } from '../../src/lib/estimating/rate-card';
import { cardToForm } from '../../src/routes/(app)/rates/card-form';
import { createWithToken, signIn, uploadPhoto } from '../helpers/http';
import { listRoutes } from '../helpers/routes';
import {
	DEMO,
	DEMO_PASSWORD,
	seededDataDir,
	startServer,
	type TestServer
} from '../helpers/server';
import { startTestFakes, type TestFakes } from '../helpers/fakes';
import { linkIn, readyEstimate } from '../helpers/proposal';
import { prepareDataDir, sceneRequest, type Prepared } from './api-helpers';
import { acceptedEstimate, crewIds, postAction, scheduleViaForm } from '../helpers/jobs';
import { localToday } from '../../src/lib/jobs/week';

const RUNS = 40;

let server: TestServer;
let dataDir: string;
let prep: Prepared;
let ownerCookie = '';
let estimatorCookie = '';
/** A member invited for the fuzz, whose role, state and password the fuzz may change. */
const target = { id: '', email: 'fuzz.target@harborpine.example', cookie: '', watch: '' };
let estimateId = '';
let crewCookie = '';
/** An accepted estimate for the schedule action, a job to move and postpone, one to close. */
const jobs = { schedulable: '', moving: '', movingRevision: 1, closing: '', crewId: '' };
/** A done job's estimate and its invoice's pay link; `started`/`paid` once a write was made. */
const bill = { estimateId: '', token: '', started: false, paid: false };
const today = localToday();
let salesCookie = '';
let fakes: TestFakes;
/** Ready estimates and live proposal links (tokens) for the proposal and customer actions. */
const prop = { sendEstimate: '', acceptToken: '', declineToken: '', paid: false };
const validUntil = new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10);
const customerData = (token: string) => getText(`/p/${token}/__data.json`, '');
/** A second estimate whose site visit is confirmed before the fuzz starts. */
let confirmedId = '';
const visit = { photoId: '', facet: {} as Record<string, string> };
/** A done job for the reports' hours action; its first recorded hours add the one row. */
const books = { doneJob: '', hoursRow: false };
const BOOKS_CUSTOMERS = 'customer_ref,name,email,phone,notes\r\nf1,Fuzz Import,,,';
const BOOKS_SITES =
	'site_ref,customer_ref,address,lat,lon,notes,gate_code,pets,water_source,no_gutters,plants_to_protect,pool,power_line\r\n,f1,1 Fuzz Row,35.52,-74.46,,,,,,,,';
const booksFingerprint = async () =>
	[
		(await getText('/data/customers', ownerCookie)).text,
		(await getText('/data/sites', ownerCookie)).text
	].join('\n');
let before: Record<string, number> = {};
/** Writes the fuzz made on purpose (answers 2xx/3xx), per table. */
const accepted: Record<string, number> = {};
/**
 * Forms whose accepted answer adds audit rows: at most one (none when nothing changed, e.g. the
 * same role again), or as many as AUDIT_ROWS says for a change that is two (a job closed is its
 * move and its final invoice; a payment is the payment and the move to paid). A refused one adds
 * none, as the per-case fingerprint and the count below show.
 */
const AUDIT_ROWS: Record<string, number> = {
	'/crew/[id] done': 2,
	'/estimates/[id] payment': 2
};
const AUDITED = new Set([
	'/estimates/[id] payment',
	'/estimates/[id] credit',
	'/rates save',
	'/settings imagery',
	'/settings contact',
	'/settings calibrate',
	'/settings resetCalibration',
	'/team invite',
	'/team role',
	'/team deactivate',
	'/team reactivate',
	'/team token',
	'/team revoke',
	'/account password',
	'/schedule schedule',
	'/crew/[id] done',
	'/estimates/[id] status',
	'/estimates/[id]/proposal send',
	'/p/[token] decline',
	'/estimates/[id]/visit confirm'
]);
let audited = 0;
let client = 0;

/** With the local mail and payment fakes: the Outbox and the deposit need them. */
const serverEnv = () => ({ ...fakes.env, ADDRESS_HEADER: 'x-forwarded-for', XFF_DEPTH: '1' });

const nextAddress = () => `10.7.${(++client >> 8) & 255}.${client & 255}`;

async function tableCounts(dir: string): Promise<Record<string, number>> {
	const db = openPglite(dir);
	try {
		await db.waitReady;
		const tables = await db.query<{ name: string }>(
			`select table_name as name from information_schema.tables
			 where table_schema = 'public' and table_type = 'BASE TABLE' order by 1`
		);
		const out: Record<string, number> = {};
		for (const { name } of tables.rows) {
			const r = await db.query<{ n: number }>(`select count(*)::int as n from "${name}"`);
			out[name] = r.rows[0].n;
		}
		return out;
	} finally {
		await db.close();
	}
}

async function session(email: string, password = DEMO_PASSWORD): Promise<string> {
	const r = await signIn(server.url, email, password, { 'x-forwarded-for': nextAddress() });
	if (!r.cookie) throw new Error(`Sign-in as ${email} failed with ${r.status}`);
	return r.cookie;
}

async function getText(path: string, cookie: string): Promise<{ status: number; text: string }> {
	const res = await fetch(server.url + path, {
		redirect: 'manual',
		headers: { cookie, accept: 'application/json' }
	});
	return { status: res.status, text: await res.text() };
}

// ——— hostile values ———

const HOSTILE = [
	'',
	' ',
	'0',
	'-1',
	'-0',
	'1e309',
	'-1e309',
	'NaN',
	'Infinity',
	'0x1F',
	'1,5',
	'9'.repeat(400),
	'true',
	'null',
	'[]',
	'{}',
	'<script>alert(1)</script>',
	'<img src=x onerror=alert(1)>',
	"' OR 1=1 --",
	'Robert"); DROP TABLE sites;--',
	'\u0000',
	'a\u0000b',
	'\uFEFF',
	'\uD800',
	'𝔚𝔯𝔢𝔫𝔣𝔦𝔢𝔩𝔡',
	'Ελληνικά 中文 العربية',
	'../../etc/passwd',
	'%00',
	'00000000-0000-0000-0000-000000000000',
	'ffffffff-ffff-ffff-ffff-ffffffffffff',
	'owner',
	'crew',
	'janitor',
	'https://',
	'https://tiles.example/{z}/{x}/{y}.png',
	'javascript:alert(1)',
	'a'.repeat(100_000)
];

const value = fc.oneof(
	{ weight: 3, arbitrary: fc.constantFrom(...HOSTILE) },
	{ weight: 2, arbitrary: fc.string({ maxLength: 40 }) },
	{ weight: 1, arbitrary: fc.string({ unit: 'grapheme', maxLength: 30 }) },
	{ weight: 1, arbitrary: fc.string({ unit: 'binary', maxLength: 30 }) },
	{ weight: 1, arbitrary: fc.integer().map(String) },
	{ weight: 1, arbitrary: fc.double().map(String) },
	{ weight: 1, arbitrary: fc.string({ minLength: 1000, maxLength: 3000 }) }
);

/** A field's value: absent, text, or a file where the form expects text. */
type FieldValue = { kind: 'text'; v: string } | { kind: 'file'; v: string } | { kind: 'absent' };
const fieldValue: fc.Arbitrary<FieldValue> = fc.oneof(
	{ weight: 8, arbitrary: value.map((v) => ({ kind: 'text' as const, v })) },
	{ weight: 1, arbitrary: value.map((v) => ({ kind: 'file' as const, v })) },
	{ weight: 2, arbitrary: fc.constant({ kind: 'absent' as const }) }
);

type Body = { fields: [string, FieldValue][]; encoding: 'urlencoded' | 'multipart' | 'json' };

/**
 * Either every field random, or a valid body with one to three fields made hostile, so the
 * runs reach the code behind the first check too. Extra keys ride along sometimes.
 */
function bodies(fields: string[], valid: () => Record<string, string>): fc.Arbitrary<Body> {
	const allRandom = fc
		.tuple(...fields.map(() => fieldValue))
		.map((vs) => fields.map((f, i) => [f, vs[i]] as [string, FieldValue]));
	const mutated = fc
		.uniqueArray(fc.constantFrom(...fields), {
			minLength: 1,
			maxLength: Math.min(3, fields.length)
		})
		.chain((keys) =>
			fc.tuple(...keys.map(() => fieldValue)).map((vs) => {
				const base = Object.entries(valid()).map(
					([k, v]) => [k, { kind: 'text', v }] as [string, FieldValue]
				);
				keys.forEach((k, i) => {
					const at = base.findIndex(([name]) => name === k);
					if (at >= 0) base[at] = [k, vs[i]];
					else base.push([k, vs[i]]);
				});
				return base;
			})
		);
	const extra = fc.array(fc.tuple(fc.string({ maxLength: 20 }), fieldValue), { maxLength: 3 });
	return fc.record({
		fields: fc
			.tuple(fc.oneof(allRandom, mutated), extra)
			.map(([f, x]) => [...f, ...x] as [string, FieldValue][]),
		encoding: fc.constantFrom('urlencoded', 'urlencoded', 'multipart', 'multipart', 'json')
	});
}

async function post(path: string, cookie: string | undefined, body: Body) {
	const headers: Record<string, string> = {
		origin: server.url,
		accept: 'text/html',
		'x-forwarded-for': nextAddress(),
		...(cookie ? { cookie } : {})
	};
	let payload: BodyInit;
	const present = body.fields.filter(([, v]) => v.kind !== 'absent') as [
		string,
		Exclude<FieldValue, { kind: 'absent' }>
	][];
	if (body.encoding === 'multipart') {
		const fd = new FormData();
		for (const [k, v] of present) {
			if (v.kind === 'file') fd.append(k, new Blob([v.v], { type: 'text/plain' }), 'note.txt');
			else fd.append(k, v.v);
		}
		payload = fd;
	} else if (body.encoding === 'urlencoded') {
		headers['content-type'] = 'application/x-www-form-urlencoded';
		payload = new URLSearchParams(present.map(([k, v]) => [k, v.v])).toString();
	} else {
		// A form action sent JSON: SvelteKit must refuse it without running the action.
		headers['content-type'] = 'application/json';
		payload = JSON.stringify(Object.fromEntries(present.map(([k, v]) => [k, v.v])));
	}
	const send = () =>
		fetch(server.url + path, { method: 'POST', redirect: 'manual', headers, body: payload });
	let res: Response;
	try {
		res = await send();
	} catch (e) {
		// A keep-alive socket reset under load is the transport, not an answer: send it once more
		// on a fresh socket. A server that died refuses the second try too, and the property fails.
		if ((e as { cause?: { code?: string } }).cause?.code !== 'ECONNRESET') throw e;
		transportRetries++;
		res = await send();
	}
	const text = await res.text();
	return { status: res.status, text, setCookie: res.headers.getSetCookie() };
}
/** Requests sent again after a socket reset (reported at the end; they should stay rare). */
let transportRetries = 0;

type FuzzCase = {
	/** The route's URL pattern and the action's name, as tests/helpers/routes.ts lists them. */
	route: string;
	action: string;
	path: () => string;
	cookie: () => string | undefined;
	fields: string[];
	valid: () => Record<string, string>;
	/** Read-only view of what the action writes; it must not change on a refusal. */
	fingerprint: () => Promise<string>;
	/** Tables a successful answer adds a row to (a function when only some successes do). */
	grows?: string[] | ((r: Awaited<ReturnType<typeof post>>) => string[]);
	/** Extra check on each answer. */
	check?: (r: Awaited<ReturnType<typeof post>>) => string | null;
	runs?: number;
};

const teamFingerprint = async () => {
	const [api, page] = await Promise.all([
		getText('/api/team', ownerCookie),
		getText('/team/__data.json', ownerCookie)
	]);
	return `${api.status} ${api.text}\n${page.status} ${page.text}`;
};

/** The moving job as the API shows it; remembers its revision so valid bodies stay current. */
/** A schedule change e-mails the customer: one outbox row, unless it had this one already. */
const jobMail = (r: { text: string }): string[] =>
	/The customer has been e-mailed|The customer’s e-mail is in the outbox/.test(r.text)
		? ['mail_outbox']
		: [];

async function movingFingerprint(): Promise<string> {
	const r = await getText(`/api/jobs/${jobs.moving}`, ownerCookie);
	const rev = /"revision":(\d+)/.exec(r.text);
	if (rev) jobs.movingRevision = Number(rev[1]);
	return r.text;
}

const CASES: FuzzCase[] = [
	{
		route: '/sign-in',
		action: 'default',
		path: () => '/sign-in',
		cookie: () => undefined,
		fields: ['email', 'password'],
		valid: () => ({ email: DEMO.owner, password: DEMO_PASSWORD }),
		// The demo password is the only right one and the fuzz never keeps it whole.
		fingerprint: async () => '',
		check: (r) =>
			r.status >= 400 && r.setCookie.some((c) => /^cp_session=[^;]+/.test(c))
				? 'a refused sign-in set a session cookie'
				: null
	},
	{
		route: '/sites/new',
		action: 'default',
		path: () => '/sites/new',
		cookie: () => estimatorCookie,
		fields: [
			'customerName',
			'customerEmail',
			'customerPhone',
			'address',
			'lat',
			'lon',
			'notes',
			'gateCode',
			'pets',
			'waterSource'
		],
		valid: () => ({
			customerName: 'Imogen Fairweather',
			address: '41 Lantern Row, Wrenfield',
			lat: '35.52',
			lon: '-74.46'
		}),
		fingerprint: async () => (await getText('/api/sites', ownerCookie)).text,
		grows: ['sites', 'customers']
	},
	{
		route: '/rates',
		action: 'save',
		path: () => '/rates?/save',
		cookie: () => ownerCookie,
		fields: [...Object.keys(cardToForm(DEFAULT_RATE_CARD)).slice(0, 12), 'note'],
		valid: () => ({ ...cardToForm(DEFAULT_RATE_CARD), note: 'fuzz' }),
		fingerprint: async () => (await getText('/api/rate-cards', ownerCookie)).text,
		grows: ['rate_cards']
	},
	{
		route: '/settings',
		action: 'imagery',
		path: () => '/settings?/imagery',
		cookie: () => ownerCookie,
		fields: ['template', 'attribution'],
		valid: () => ({ template: '', attribution: '' }),
		fingerprint: async () => (await getText('/settings/__data.json', ownerCookie)).text
	},
	{
		route: '/settings',
		action: 'contact',
		path: () => '/settings?/contact',
		cookie: () => ownerCookie,
		fields: ['phone', 'email', 'postalAddress', 'licence'],
		valid: () => ({
			phone: '(555) 010-0142',
			email: 'office@harborpine.example',
			postalAddress: '18 Ropewalk Lane, Wrenfield',
			licence: 'Insured'
		}),
		fingerprint: async () => (await getText('/settings/__data.json', ownerCookie)).text
	},
	// No site-visit facets carry a suggestion here and nothing is calibrated: both are refused.
	{
		route: '/settings',
		action: 'calibrate',
		path: () => '/settings?/calibrate',
		cookie: () => ownerCookie,
		fields: ['x'],
		valid: () => ({}),
		fingerprint: async () => (await getText('/settings/__data.json', ownerCookie)).text
	},
	{
		route: '/settings',
		action: 'resetCalibration',
		path: () => '/settings?/resetCalibration',
		cookie: () => ownerCookie,
		fields: ['x'],
		valid: () => ({}),
		fingerprint: async () => (await getText('/settings/__data.json', ownerCookie)).text
	},
	{
		route: '/team',
		action: 'invite',
		path: () => '/team?/invite',
		cookie: () => ownerCookie,
		fields: ['name', 'email', 'role', 'password'],
		valid: () => ({
			name: 'Odile Marchbank',
			email: `odile.${client}@harborpine.example`,
			role: 'sales',
			password: 'a-long-first-password'
		}),
		fingerprint: teamFingerprint,
		grows: ['users']
	},
	{
		route: '/team',
		action: 'role',
		path: () => '/team?/role',
		cookie: () => ownerCookie,
		fields: ['userId', 'role'],
		valid: () => ({ userId: target.id, role: 'sales' }),
		fingerprint: teamFingerprint
	},
	{
		route: '/team',
		action: 'deactivate',
		path: () => '/team?/deactivate',
		cookie: () => ownerCookie,
		fields: ['userId'],
		valid: () => ({ userId: target.id }),
		fingerprint: teamFingerprint
	},
	{
		route: '/team',
		action: 'reactivate',
		path: () => '/team?/reactivate',
		cookie: () => ownerCookie,
		fields: ['userId'],
		valid: () => ({ userId: target.id }),
		fingerprint: teamFingerprint
	},
	{
		route: '/team',
		action: 'token',
		path: () => '/team?/token',
		cookie: () => ownerCookie,
		fields: ['name'],
		valid: () => ({ name: 'Route planner' }),
		fingerprint: teamFingerprint,
		grows: ['api_tokens']
	},
	{
		route: '/team',
		action: 'revoke',
		path: () => '/team?/revoke',
		cookie: () => ownerCookie,
		fields: ['tokenId'],
		valid: () => ({ tokenId: '00000000-0000-4000-8000-000000000000' }),
		fingerprint: teamFingerprint
	},
	{
		route: '/account',
		action: 'password',
		path: () => '/account?/password',
		cookie: () => target.cookie,
		fields: ['current', 'next', 'confirm'],
		valid: () => ({
			current: 'fuzz-target-password',
			next: 'fuzz-target-password',
			confirm: 'fuzz-target-password'
		}),
		// A changed password ends the member's other sessions: the watching one shows it.
		fingerprint: async () => String((await getText('/api/me', target.watch)).status)
	},
	...visitCases(),
	{
		route: '/schedule',
		action: 'schedule',
		path: () => '/schedule?/schedule',
		cookie: () => ownerCookie,
		fields: ['estimateId', 'date', 'windowStart', 'windowEnd', 'crewIds'],
		valid: () => ({
			estimateId: jobs.schedulable,
			date: today,
			windowStart: '08:00',
			windowEnd: '10:00',
			crewIds: jobs.crewId
		}),
		fingerprint: async () =>
			[
				(await getText(`/api/estimates/${jobs.schedulable}`, ownerCookie)).text,
				(await getText('/schedule/__data.json', ownerCookie)).text
			].join('\n'),
		// The job, and the customer's e-mail of its date.
		grows: (r) => ['jobs', ...jobMail(r)]
	},
	{
		route: '/schedule',
		action: 'move',
		path: () => '/schedule?/move',
		cookie: () => ownerCookie,
		fields: ['jobId', 'revision', 'date', 'windowStart', 'windowEnd', 'crewIds'],
		valid: () => ({
			jobId: jobs.moving,
			revision: String(jobs.movingRevision),
			date: today,
			windowStart: '13:00',
			windowEnd: '14:00',
			crewIds: jobs.crewId
		}),
		fingerprint: movingFingerprint,
		grows: jobMail
	},
	{
		route: '/schedule',
		action: 'postpone',
		path: () => '/schedule?/postpone',
		cookie: () => ownerCookie,
		fields: ['jobId', 'revision', 'reason', 'newDate'],
		valid: () => ({
			jobId: jobs.moving,
			revision: String(jobs.movingRevision),
			reason: 'Rain forecast all morning',
			newDate: ''
		}),
		fingerprint: movingFingerprint,
		grows: jobMail
	},
	{
		route: '/crew/[id]',
		action: 'done',
		path: () => `/crew/${jobs.closing}?/done`,
		cookie: () => crewCookie,
		fields: ['reason'],
		valid: () => ({ reason: 'After photos sent to the office by text' }),
		fingerprint: async () => (await getText(`/api/jobs/${jobs.closing}`, ownerCookie)).text,
		// Closing writes the reason into the job's log (a new row for a job with none yet), and
		// issues the final invoice with its pay link and e-mail.
		grows: ['job_logs', 'invoices', 'invoice_links', 'mail_outbox']
	},
	{
		route: '/estimates/[id]',
		action: 'status',
		path: () => `/estimates/${estimateId}?/status`,
		cookie: () => estimatorCookie,
		fields: ['status'],
		valid: () => ({ status: 'sent' }),
		fingerprint: async () => (await getText(`/api/estimates/${estimateId}`, ownerCookie)).text
	},
	{
		route: '/estimates/[id]/proposal',
		action: 'send',
		path: () => `/estimates/${prop.sendEstimate}/proposal?/send`,
		cookie: () => salesCookie,
		fields: ['to', 'validUntil'],
		valid: () => ({ to: 'fuzz.customer@wrenfield.example', validUntil }),
		fingerprint: async () =>
			(await getText(`/estimates/${prop.sendEstimate}/proposal/__data.json`, ownerCookie)).text,
		// The first send makes the proposal and its e-mail; later ones send nothing new.
		grows: (r) => (r.text.includes('Version 1 sent to') ? ['proposals', 'mail_outbox'] : [])
	},
	{
		route: '/estimates/[id]/proposal',
		action: 'revoke',
		path: () => `/estimates/${prop.sendEstimate}/proposal?/revoke`,
		cookie: () => salesCookie,
		fields: ['proposalId'],
		valid: () => ({ proposalId: '00000000-0000-4000-8000-000000000000' }),
		fingerprint: async () =>
			(await getText(`/estimates/${prop.sendEstimate}/proposal/__data.json`, ownerCookie)).text
	},
	{
		route: '/estimates/[id]/proposal',
		action: 'retryMail',
		path: () => `/estimates/${prop.sendEstimate}/proposal?/retryMail`,
		cookie: () => salesCookie,
		fields: ['mailId'],
		valid: () => ({ mailId: '00000000-0000-4000-8000-000000000000' }),
		fingerprint: async () =>
			(await getText(`/estimates/${prop.sendEstimate}/proposal/__data.json`, ownerCookie)).text
	},
	{
		route: '/outbox',
		action: 'retry',
		path: () => '/outbox?/retry',
		cookie: () => ownerCookie,
		fields: ['mailId'],
		valid: () => ({ mailId: '00000000-0000-4000-8000-000000000000' }),
		fingerprint: async () => (await getText('/outbox/__data.json', ownerCookie)).text
	},
	{
		route: '/p/[token]',
		action: 'accept',
		path: () => `/p/${prop.acceptToken}?/accept`,
		cookie: () => undefined,
		fields: ['fullName', 'consent', 'extras', 'priceCents', 'totalCents'],
		valid: () => ({
			fullName: 'Marisol Quenby',
			consent: 'yes',
			extras: 'gutter_brightening',
			priceCents: '1',
			totalCents: '1'
		}),
		fingerprint: async () => (await customerData(prop.acceptToken)).text,
		grows: ['proposal_answers']
	},
	{
		route: '/p/[token]',
		action: 'decline',
		path: () => `/p/${prop.declineToken}?/decline`,
		cookie: () => undefined,
		fields: ['decision', 'reason'],
		valid: () => ({ decision: 'declined', reason: 'Going with a neighbour' }),
		fingerprint: async () => (await customerData(prop.declineToken)).text,
		grows: ['proposal_answers']
	},
	{
		route: '/p/[token]',
		action: 'pay',
		path: () => `/p/${prop.acceptToken}?/pay`,
		cookie: () => undefined,
		fields: ['amountCents', 'currency'],
		valid: () => ({ amountCents: '1', currency: 'usd' }),
		fingerprint: async () => (await customerData(prop.acceptToken)).text,
		// The first starts the deposit checkout; later ones return the same open session.
		grows: () => (prop.paid ? [] : ((prop.paid = true), ['deposit_checkouts']))
	},
	{
		route: '/i/[token]',
		action: 'pay',
		path: () => `/i/${bill.token}?/pay`,
		cookie: () => undefined,
		fields: ['amountCents', 'currency'],
		valid: () => ({ amountCents: '1', currency: 'usd' }),
		fingerprint: async () => (await getText(`/i/${bill.token}/__data.json`, '')).text,
		// The first starts the balance checkout; later ones return the same open session.
		grows: () => (bill.started ? [] : ((bill.started = true), ['deposit_checkouts']))
	},
	{
		// Before the payment case: once paid, every credit is refused (409).
		route: '/estimates/[id]',
		action: 'credit',
		path: () => `/estimates/${bill.estimateId}?/credit`,
		cookie: () => ownerCookie,
		fields: ['amount', 'reason'],
		valid: () => ({ amount: '1.00', reason: 'Fuzz credit' }),
		fingerprint: async () =>
			(await getText(`/estimates/${bill.estimateId}/__data.json`, ownerCookie)).text,
		grows: ['invoices']
	},
	{
		route: '/estimates/[id]',
		action: 'payment',
		path: () => `/estimates/${bill.estimateId}?/payment`,
		cookie: () => ownerCookie,
		fields: ['method', 'reference', 'amountCents'],
		valid: () => ({ method: 'cheque', reference: 'Cheque 7', amountCents: '1' }),
		fingerprint: async () =>
			(await getText(`/estimates/${bill.estimateId}/__data.json`, ownerCookie)).text,
		grows: () => (bill.paid ? [] : ((bill.paid = true), ['invoice_payments']))
	},
	{
		route: '/data',
		action: 'preview',
		path: () => '/data?/preview',
		cookie: () => ownerCookie,
		fields: ['customers', 'sites'],
		valid: () => ({ customers: BOOKS_CUSTOMERS, sites: BOOKS_SITES }),
		fingerprint: booksFingerprint
	},
	{
		route: '/data',
		action: 'import',
		path: () => '/data?/import',
		cookie: () => ownerCookie,
		fields: ['customers', 'sites'],
		valid: () => ({ customers: BOOKS_CUSTOMERS, sites: BOOKS_SITES }),
		fingerprint: booksFingerprint,
		grows: (r) => {
			const m = /Imported (\d+) customers? and (\d+) sites?/.exec(r.text);
			return m
				? [
						...Array<string>(Number(m[1])).fill('customers'),
						...Array<string>(Number(m[2])).fill('sites')
					]
				: [];
		}
	},
	{
		route: '/reports',
		action: 'hours',
		path: () => '/reports?/hours',
		cookie: () => ownerCookie,
		fields: ['jobId', 'hours'],
		valid: () => ({ jobId: books.doneJob, hours: '3.5' }),
		fingerprint: async () => (await getText('/reports/__data.json', ownerCookie)).text,
		grows: () => (books.hoursRow ? [] : ((books.hoursRow = true), ['job_hours']))
	}
];

/** The site-visit screen's actions; its page data is what they write. */
function visitCases(): FuzzCase[] {
	const fingerprint = (id: () => string) => async () =>
		(await getText(`/estimates/${id()}/visit/__data.json`, ownerCookie)).text;
	const open = () => estimateId;
	const base = (action: string, id = open) => ({
		route: '/estimates/[id]/visit',
		action,
		path: () => `/estimates/${id()}/visit?/${action}`,
		cookie: () => estimatorCookie,
		fingerprint: fingerprint(id)
	});
	return [
		// Started before the fuzz: a repeated start answers the same visit and writes nothing.
		{ ...base('start'), fields: ['x'], valid: () => ({}) },
		{
			...base('facet'),
			fields: ['facetId', 'pitch', 'material', 'growth', 'access', 'stories'],
			valid: () => visit.facet
		},
		{
			...base('site'),
			fields: ['obstacles', 'waterSource', 'pets', 'gateNotes', 'notes'],
			valid: () => ({ obstacles: 'fence', waterSource: 'Spigot at the side', pets: 'none' })
		},
		{
			...base('testSpot'),
			fields: ['strengthPct', 'secondsToColourChange', 'rinsedClean', 'facetIds'],
			valid: () => ({
				strengthPct: '3',
				secondsToColourChange: '40',
				rinsedClean: 'yes',
				facetIds: visit.facet.facetId
			})
		},
		// Confirmed before the fuzz (its first confirmation is tested in site-visit.spec.ts).
		{ ...base('confirm', () => confirmedId), fields: ['x'], valid: () => ({}) },
		{
			...base('photo'),
			fields: ['photoId', 'forProposal'],
			valid: () => ({ photoId: visit.photoId, forProposal: 'true' })
		},
		{
			...base('deletePhoto'),
			fields: ['photoId'],
			valid: () => ({ photoId: '00000000-0000-4000-8000-000000000000' })
		}
	];
}

beforeAll(async () => {
	dataDir = seededDataDir('form-fuzz');
	prep = await prepareDataDir(dataDir);
	fakes = await startTestFakes();
	server = await startServer(dataDir, serverEnv());
	ownerCookie = await session(DEMO.owner);
	estimatorCookie = await session(DEMO.estimator);
	const invite = await post('/team?/invite', ownerCookie, {
		encoding: 'urlencoded',
		fields: Object.entries({
			name: 'Fuzz Target',
			email: target.email,
			role: 'estimator',
			password: 'fuzz-target-password'
		}).map(([k, v]) => [k, { kind: 'text', v }])
	});
	if (invite.status !== 200) throw new Error(`invite: ${invite.status}`);
	const team = JSON.parse((await getText('/api/team', ownerCookie)).text) as {
		members: { id: string; email: string }[];
	};
	target.id = team.members.find((m) => m.email === target.email)!.id;
	target.cookie = await session(target.email, 'fuzz-target-password');
	target.watch = await session(target.email, 'fuzz-target-password');
	// The test seed has no estimates: make one through the API for the status action.
	const site = prep.sites.find((s) => s.houseId)!;
	type Created = { plan: { id: string }; estimate: { id: string } };
	const call = (path: string, body: unknown) =>
		createWithToken<Created>(server.url, prep.ownerToken, path, body);
	await call('/api/roof-plans', {
		siteId: site.id,
		facets: planFacetsOf(site.houseId!),
		baseVersion: null
	});
	estimateId = (
		await call('/api/estimates', { ...sceneRequest(site.houseId!), siteId: site.id, save: true })
	).estimate.id;
	// Jobs for the scheduling and crew-sheet actions.
	crewCookie = await session(DEMO.crew);
	jobs.crewId = (await crewIds(server.url, prep.ownerToken))[DEMO.crew];
	jobs.schedulable = await acceptedEstimate(server.url, prep.ownerToken, site);
	for (const key of ['moving', 'closing'] as const) {
		jobs[key] = await scheduleViaForm(server.url, ownerCookie, {
			estimateId: await acceptedEstimate(server.url, prep.ownerToken, site),
			date: today,
			crewIds: [jobs.crewId]
		});
	}
	// A closed job with its final invoice: the owner's payment record and the customer's pay page.
	bill.estimateId = await acceptedEstimate(server.url, prep.ownerToken, site);
	const billed = await scheduleViaForm(server.url, ownerCookie, {
		estimateId: bill.estimateId,
		date: today,
		crewIds: [jobs.crewId]
	});
	const closed = await postAction(server.url, ownerCookie, `/crew/${billed}?/done`, {
		reason: 'Closed for the fuzz, with no photos'
	});
	if (closed.type !== 'success') throw new Error(`done: ${closed.status} ${closed.data}`);
	bill.token =
		/\/i\/([A-Za-z0-9_-]{43})/.exec(
			fakes.smtp.messages().find((m) => /^Invoice \d+/.test(m.subject ?? ''))?.text ?? ''
		)?.[1] ?? '';
	if (!bill.token) throw new Error('No invoice e-mail with a pay link.');
	// Proposals: one ready estimate to send, and two sent ones whose links the customer's
	// actions use.
	salesCookie = await session(DEMO.sales);
	prop.sendEstimate = (await readyEstimate(server.url, prep, 'h02')).id;
	const tokenFor = async (house: string) => {
		const id = (await readyEstimate(server.url, prep, house)).id;
		const r = await post(`/estimates/${id}/proposal?/send`, salesCookie, {
			encoding: 'urlencoded',
			fields: Object.entries({ to: `${house}@wrenfield.example`, validUntil }).map(([k, v]) => [
				k,
				{ kind: 'text', v }
			])
		});
		if (r.status !== 200) throw new Error(`send: ${r.status}`);
		const to = `${house}@wrenfield.example`;
		return linkIn(fakes.smtp.messages().find((m) => m.to.includes(to))?.text ?? null).split(
			'/p/'
		)[1];
	};
	prop.acceptToken = await tokenFor('h03');
	prop.declineToken = await tokenFor('h04');
	// The site-visit actions: a started visit with a photo, and a second estimate's confirmed visit.
	const other = prep.sites.filter((s) => s.houseId)[1];
	confirmedId = (
		await call('/api/estimates', { ...sceneRequest(other.houseId!), siteId: other.id, save: true })
	).estimate.id;
	for (const [id, name] of [
		[estimateId, 'start'],
		[confirmedId, 'start'],
		[confirmedId, 'confirm']
	]) {
		const r = await post(`/estimates/${id}/visit?/${name}`, ownerCookie, {
			encoding: 'urlencoded',
			fields: []
		});
		if (r.status !== 200) throw new Error(`visit ${name}: ${r.status}`);
	}
	visit.photoId = (await uploadPhoto(server.url, prep.ownerToken, estimateId, 'fuzz.jpg')).photo.id;
	const f = planFacetsOf(site.houseId!)[0];
	visit.facet = {
		facetId: f.id,
		pitch: String(f.pitch),
		material: f.material,
		growth: f.growth,
		access: f.access,
		stories: String(f.stories)
	};
	// A done job for the reports' hours action.
	books.doneJob = await scheduleViaForm(server.url, ownerCookie, {
		estimateId: await acceptedEstimate(server.url, prep.ownerToken, site),
		date: today,
		crewIds: [jobs.crewId]
	});
	const closedForBooks = await post(`/crew/${books.doneJob}?/done`, ownerCookie, {
		encoding: 'urlencoded',
		fields: [['reason', { kind: 'text', v: 'Fuzz set-up: photos kept on the crew phone.' }]]
	});
	if (closedForBooks.status !== 200) throw new Error(`done: ${closedForBooks.status}`);
	// Counted with the server stopped (PGlite opens a data directory in one process at a time).
	await server.stop();
	before = await tableCounts(dataDir);
	server = await startServer(dataDir, serverEnv());
	fakes.payments.setWebhookUrl(`${server.url}/api/payments/webhook`);
}, 300_000);
afterAll(async () => {
	await server?.stop();
	await fakes?.stop();
});

describe('form actions under fuzz', () => {
	it('covers every form action under src/routes', () => {
		const actions = listRoutes().flatMap((r) => r.actions.map((a) => `${r.pattern} ${a}`));
		const fuzzed = new Set(CASES.map((c) => `${c.route} ${c.action}`));
		// Signing out takes no input; it has its own test below.
		expect(actions.filter((a) => !fuzzed.has(a) && a !== '/sign-out default')).toEqual([]);
	});

	for (const c of CASES) {
		it(`${c.route} ?/${c.action}: no 5xx, and a refusal changes nothing`, async () => {
			const seen: Record<number, number> = {};
			await fc.assert(
				fc.asyncProperty(bodies(c.fields, c.valid), async (body) => {
					const was = await c.fingerprint();
					const r = await post(c.path(), c.cookie(), body);
					seen[r.status] = (seen[r.status] ?? 0) + 1;
					if (r.status >= 500) throw new Error(`${r.status}: ${r.text.slice(0, 300)}`);
					const problem = c.check?.(r);
					if (problem) throw new Error(problem);
					if (r.status >= 400) {
						expect(await c.fingerprint()).toBe(was);
					} else {
						const grows = typeof c.grows === 'function' ? c.grows(r) : (c.grows ?? []);
						for (const t of grows) accepted[t] = (accepted[t] ?? 0) + 1;
						const key = `${c.route} ${c.action}`;
						if (AUDITED.has(key)) audited += AUDIT_ROWS[key] ?? 1;
					}
				}),
				{ numRuns: c.runs ?? RUNS }
			);
			// Refusals must have been tried, or the property says nothing.
			expect(Object.keys(seen).some((s) => Number(s) >= 400)).toBe(true);
			// Forty requests that each re-price or re-read a page: on a shared two-core machine a
			// case can take minutes, and the answer, not the time, is what is tested here.
		}, 300_000);
	}

	it('refuses a NUL in stored free text with a field message (a 500 the fuzz found)', async () => {
		// PostgreSQL documents that text values cannot contain the NUL character
		// (https://www.postgresql.org/docs/current/datatype-character.html); the write used to fail.
		const nul = 'a\u0000b';
		const form = (o: Record<string, string>): Body => ({
			encoding: 'urlencoded',
			fields: Object.entries(o).map(([k, v]) => [k, { kind: 'text', v }])
		});
		const tries: [string, string, Record<string, string>, () => Promise<string>][] = [
			['/team?/token', ownerCookie, { name: nul }, teamFingerprint],
			[
				'/team?/invite',
				ownerCookie,
				{
					name: nul,
					email: 'nul.name@harborpine.example',
					role: 'sales',
					password: 'a-long-first-password'
				},
				teamFingerprint
			],
			[
				'/sites/new',
				estimatorCookie,
				{ ...CASES[1].valid(), notes: nul },
				async () => (await getText('/api/sites', ownerCookie)).text
			],
			[
				'/sites/new',
				estimatorCookie,
				{ ...CASES[1].valid(), customerName: nul },
				async () => (await getText('/api/sites', ownerCookie)).text
			],
			[
				'/settings?/imagery',
				ownerCookie,
				{ template: '', attribution: nul },
				async () => (await getText('/settings/__data.json', ownerCookie)).text
			],
			[
				'/rates?/save',
				ownerCookie,
				{ ...cardToForm(DEFAULT_RATE_CARD), note: nul },
				async () => (await getText('/api/rate-cards', ownerCookie)).text
			],
			[
				`/p/${prop.acceptToken}?/accept`,
				'',
				{ fullName: nul, consent: 'yes' },
				async () => (await customerData(prop.acceptToken)).text
			],
			[
				`/p/${prop.declineToken}?/decline`,
				'',
				{ decision: 'declined', reason: nul },
				async () => (await customerData(prop.declineToken)).text
			],
			[
				`/estimates/${estimateId}/visit?/site`,
				estimatorCookie,
				{ gateNotes: nul },
				async () => (await getText(`/estimates/${estimateId}/visit/__data.json`, ownerCookie)).text
			]
		];
		for (const [path, cookie, body, fingerprint] of tries) {
			const was = await fingerprint();
			const r = await post(path, cookie, form(body));
			expect(r.status, path).toBe(400);
			expect(r.text, path).toContain('Remove the control character (NUL) from this text.');
			expect(await fingerprint(), path).toBe(was);
		}
	});

	it('/sign-out: any body signs out and nothing answers 5xx', async () => {
		await fc.assert(
			fc.asyncProperty(
				bodies(['x'], () => ({})),
				async (body) => {
					const r = await post('/sign-out', estimatorCookie, body);
					if (r.status >= 500) throw new Error(`${r.status}: ${r.text.slice(0, 300)}`);
					// Kit refuses a JSON body to a form action (415) before the action runs.
					if (body.encoding === 'json') expect(r.status).toBe(415);
					else
						expect([r.status, r.setCookie.some((s) => s.startsWith('cp_session=;'))]).toEqual([
							303,
							true
						]);
					estimatorCookie = await session(DEMO.estimator);
				}
			),
			{ numRuns: 8 }
		);
	});

	it('wrote only the rows of accepted answers', async () => {
		await server.stop();
		const after = await tableCounts(dataDir);
		const expected = { ...before };
		for (const [t, n] of Object.entries(accepted)) expected[t] += n;
		// Sessions come and go with every sign-in and sign-out the fuzz makes.
		delete expected.sessions;
		delete after.sessions;
		// The audit log: at most one row per accepted change, none from anything else.
		const auditRows = after.audit_log - before.audit_log;
		delete expected.audit_log;
		delete after.audit_log;
		if (transportRetries)
			console.warn(`form fuzz: ${transportRetries} request(s) resent after ECONNRESET`);
		expect(transportRetries).toBeLessThanOrEqual(3);
		expect(auditRows).toBeGreaterThan(0);
		expect(auditRows).toBeLessThanOrEqual(audited);
		expect(after).toEqual(expected);
		server = await startServer(dataDir, serverEnv());
	});
});
