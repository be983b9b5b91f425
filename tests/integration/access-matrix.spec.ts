// Every route × every kind of caller × every method the route answers, against the built server
// on a fresh seeded PGlite. The routes are read from src/routes (tests/helpers/routes.ts); the
// expected roles below are written out by hand from the role descriptions in PRODUCT.md ("Users
// and roles"), not copied from src/lib/roles.ts, so the table and the server are checked against
// a third statement of who may open what.
import { openPglite } from '../helpers/pglite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, type Role } from '../../src/lib/roles';
import { hashSessionToken, newSessionToken } from '../../src/lib/server/auth/tokens';
import { createWithToken, signIn, uploadPhoto } from '../helpers/http';
import { listRoutes, type RouteInfo } from '../helpers/routes';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { planFacetsOf } from '../../geodata/scene';
import { startTestFakes, type TestFakes } from '../helpers/fakes';
import { linkIn } from '../helpers/proposal';
import { prepareDataDir, sceneRequest, type Prepared } from './api-helpers';
import { acceptedEstimate, crewIds, postAction, scheduleViaForm } from '../helpers/jobs';
import { localToday } from '../../src/lib/jobs/week';

const OFFICE: Role[] = ['owner', 'estimator', 'sales'];
const ALL: Role[] = [...ROLES];

/** Who may open each route (by URL pattern). A route missing here fails the first test. */
const EXPECTED: Record<string, Role[] | 'public'> = {
	'/': ALL,
	'/sign-in': 'public',
	'/sign-out': ALL,
	'/account': ALL,
	'/sites': OFFICE,
	'/sites/new': OFFICE,
	'/sites/[id]': OFFICE,
	'/sites/[id]/roof': OFFICE,
	'/estimates': OFFICE,
	'/estimates/[id]': OFFICE,
	'/schedule': ['owner', 'sales'],
	'/estimates/[id]/proposal': OFFICE,
	// The customer has no account: the private link is the key.
	'/p/[token]': 'public',
	'/p/[token]/photos/[id]': 'public',
	// The final invoice's pay page: no account, the private link is the key.
	'/i/[token]': 'public',
	'/outbox': ['owner'],
	'/estimates/[id]/visit': OFFICE,
	'/crew': ['owner', 'crew'],
	// The sheet of a job the demo crew member is on; other crew get 404 (tests/integration/jobs.spec.ts).
	'/crew/[id]': ['owner', 'crew'],
	'/rates': ['owner'],
	'/team': ['owner'],
	'/settings': ['owner'],
	// The owner's books: reports, their tables' CSV, and the lists' export and import.
	'/reports': ['owner'],
	'/reports/[table]': ['owner'],
	'/data': ['owner'],
	'/data/[kind]': ['owner'],
	'/settings/backup': ['owner'],
	'/audit': ['owner'],
	'/api/health': 'public',
	'/api/me': ALL,
	'/api/docs': OFFICE,
	'/api/openapi.json': OFFICE,
	'/api/estimates': OFFICE,
	'/api/estimates/[id]': OFFICE,
	'/api/estimates/[id]/photos': OFFICE,
	'/api/rate-cards': OFFICE,
	'/api/roof-plans': OFFICE,
	'/api/roof-plans/[id]': OFFICE,
	'/api/sites': OFFICE,
	'/api/sites/[id]': OFFICE,
	'/api/sites/[id]/roof-plans': OFFICE,
	'/api/sites/[id]/roof-plans/[version]': OFFICE,
	'/api/team': ['owner'],
	'/api/jobs/[id]': ['owner', 'sales', 'crew'],
	'/api/jobs/[id]/log': ['owner', 'crew'],
	'/api/jobs/[id]/photos': ['owner', 'crew'],
	// The payment service has no account: the signature on the body is the check.
	'/api/payments/webhook': 'public',
	// Site-visit photos: every signed-in member of the company; tokens open the API only.
	'/photos/[id]/[rendition]': ALL,
	'/tiles/tiles.json': 'public',
	'/tiles/[z]/[x]/[y]': 'public'
};

/**
 * Actions narrower than their page's row (the action's own requireRole), by `pattern ?/action`:
 * the owner alone records a payment on an estimate the office can open.
 */
const ACTION_EXPECTED: Record<string, Role[]> = {
	'/estimates/[id] ?/payment': ['owner'],
	'/estimates/[id] ?/credit': ['owner']
};

const CALLERS = ['anonymous', ...ROLES, 'api token', 'revoked token', 'deactivated user'] as const;
type Caller = (typeof CALLERS)[number];

/** What the guard should answer: let it through, refuse (401/403), or send to sign-in. */
type Outcome = 'through' | '401' | '403' | 'sign-in';

type Cell = {
	route: RouteInfo;
	method: string;
	/** The path with real seeded ids (filled in once they exist), plus `?/action` for a named action. */
	path: () => string;
	form: boolean;
	body?: string;
};

const routes = listRoutes();
let server: TestServer;
let prep: Prepared;
const ids = {
	site: '',
	estimate: '',
	roofPlan: '',
	job: '',
	token: '',
	photo: '',
	invoiceToken: '',
	proposalPhoto: ''
};
let fakes: TestFakes;
const cookies = {} as Record<Role, string>;
/** One session per cell for a user deactivated after signing in: the first use ends it. */
const deactivatedSessions: string[] = [];

function fillIds(pattern: string): string {
	const path = pattern
		.replace(/\/sites\/\[id\]/, `/sites/${ids.site}`)
		.replace(/\/estimates\/\[id\]/, `/estimates/${ids.estimate}`)
		.replace('/p/[token]/photos/[id]', `/p/${ids.token}/photos/${ids.proposalPhoto}`)
		.replace('/p/[token]', `/p/${ids.token}`)
		.replace('/i/[token]', `/i/${ids.invoiceToken}`)
		.replace(/\/roof-plans\/\[id\]/, `/roof-plans/${ids.roofPlan}`)
		.replace(/^\/crew\/\[id\]/, `/crew/${ids.job}`)
		.replace(/^\/api\/jobs\/\[id\]/, `/api/jobs/${ids.job}`)
		.replace('/roof-plans/[version]', '/roof-plans/latest')
		.replace('/tiles/[z]/[x]/[y]', '/tiles/0/0/0.webp')
		.replace('/photos/[id]/[rendition]', `/photos/${ids.photo}/thumb`)
		.replace('/reports/[table]', '/reports/pipeline')
		.replace('/data/[kind]', '/data/customers');
	if (path.includes('[')) throw new Error(`Give ${pattern} a real sample id in fillIds.`);
	return path;
}

/** Bodies the allowed callers' requests are refused with by validation (400), so nothing is written. */
function cellsOf(route: RouteInfo): Cell[] {
	const path = () => fillIds(route.pattern);
	const cells: Cell[] = [];
	if (route.page) cells.push({ route, method: 'GET', path, form: false });
	for (const a of route.actions) {
		cells.push({
			route,
			method: 'POST',
			path: a === 'default' ? path : () => `${path()}?/${a}`,
			form: true,
			body: new URLSearchParams({ probe: 'access-matrix' }).toString()
		});
	}
	for (const m of route.methods) {
		cells.push({
			route,
			method: m,
			path,
			form: false,
			body: m === 'GET' || m === 'HEAD' ? undefined : '{}'
		});
	}
	return cells;
}

const CELLS = routes.flatMap(cellsOf);

function expected(cell: Cell, caller: Caller): Outcome {
	const action = /\?\/(\w+)$/.exec(cell.path())?.[1];
	const allowed =
		(action && ACTION_EXPECTED[`${cell.route.pattern} ?/${action}`]) ||
		EXPECTED[cell.route.pattern];
	if (allowed === 'public') return 'through';
	const isApi = cell.route.pattern.startsWith('/api/');
	const signedOut =
		caller === 'anonymous' || caller === 'revoked token' || caller === 'deactivated user';
	if (signedOut) return isApi ? '401' : 'sign-in';
	// The token is the owner's; tokens open the API only.
	if (caller === 'api token') return isApi && allowed.includes('owner') ? 'through' : '403';
	return allowed.includes(caller) ? 'through' : '403';
}

async function authFor(caller: Caller, cell: Cell): Promise<Record<string, string>> {
	switch (caller) {
		case 'anonymous':
			return {};
		case 'api token':
			return { authorization: `Bearer ${prep.ownerToken}` };
		case 'revoked token':
			return { authorization: `Bearer ${prep.revokedToken}` };
		case 'deactivated user':
			return { cookie: `cp_session=${deactivatedSessions.pop()}` };
		default:
			// Signing out ends the session, so that cell gets a session of its own.
			if (cell.route.pattern === '/sign-out' && cell.method === 'POST') {
				return { cookie: await sessionCookie(caller) };
			}
			return { cookie: cookies[caller] };
	}
}

let client = 0;
async function sessionCookie(role: Role): Promise<string> {
	const r = await signIn(server.url, DEMO[role], undefined, {
		'x-forwarded-for': `10.9.0.${++client}`
	});
	if (!r.cookie) throw new Error(`Sign-in as ${role} failed with ${r.status}`);
	return r.cookie;
}

function outcomeOf(status: number, location: string | null): Outcome | `other ${number}` {
	if (status === 401) return '401';
	if (status === 403) return '403';
	// The guard's redirect carries `next`; signing out itself ends on a plain /sign-in.
	if (status === 303 && location?.startsWith('/sign-in?next=')) return 'sign-in';
	// 400 is a refusal by validation, which proves the guard let the request through.
	if ((status >= 200 && status < 400) || status === 400) return 'through';
	return `other ${status}`;
}

beforeAll(async () => {
	const dir = seededDataDir('access-matrix');
	prep = await prepareDataDir(dir);
	const db = openPglite(dir);
	try {
		await db.waitReady;
		// A user who signed in and was then deactivated: the sessions survive in the table, so
		// every request below tests that the guard checks `active`, not just the session.
		const owner = (
			await db.query<{ company_id: string }>(`select company_id from users where role = 'owner'`)
		).rows[0];
		const user = (
			await db.query<{ id: string }>(
				`insert into users (company_id, email, name, role, password_hash, active)
				 values ($1, 'former.estimator@harborpine.example', 'Former Estimator', 'estimator', 'x', false)
				 returning id`,
				[owner.company_id]
			)
		).rows[0];
		for (let i = 0; i < CELLS.length + 8; i++) {
			const token = newSessionToken();
			await db.query(
				`insert into sessions (id, user_id, company_id, expires_at)
				 values ($1, $2, $3, now() + interval '1 day')`,
				[hashSessionToken(token), user.id, owner.company_id]
			);
			deactivatedSessions.push(token);
		}
	} finally {
		await db.close();
	}
	// With the local mail and payment fakes: the Outbox is a demo-mode page, and the customer's
	// page needs a real link, whose token only the e-mail carries.
	fakes = await startTestFakes();
	server = await startServer(dir, {
		...fakes.env,
		ADDRESS_HEADER: 'x-forwarded-for',
		XFF_DEPTH: '1'
	});
	fakes.payments.setWebhookUrl(`${server.url}/api/payments/webhook`);
	for (const role of ROLES) cookies[role] = await sessionCookie(role);
	// The test seed has no plans or estimates: make one of each through the API.
	const site = prep.sites.find((s) => s.houseId)!;
	ids.site = site.id;
	type Created = { plan: { id: string }; estimate: { id: string } };
	const post = (path: string, body: unknown) =>
		createWithToken<Created>(server.url, prep.ownerToken, path, body);
	const facets = planFacetsOf(site.houseId!);
	ids.roofPlan = (
		await post('/api/roof-plans', { siteId: site.id, facets, baseVersion: null })
	).plan.id;
	ids.estimate = (
		await post('/api/estimates', { ...sceneRequest(site.houseId!), siteId: site.id, save: true })
	).estimate.id;
	// A job for the demo crew member, so the crew sheet and job routes have a real id.
	const acceptedId = await acceptedEstimate(server.url, prep.ownerToken, site);
	const crew = await crewIds(server.url, prep.ownerToken);
	ids.job = await scheduleViaForm(server.url, cookies.owner, {
		estimateId: acceptedId,
		date: localToday(),
		crewIds: [crew[DEMO.crew]]
	});
	// A site visit with one photo, for the photo routes.
	const started = await fetch(`${server.url}/estimates/${ids.estimate}/visit?/start`, {
		method: 'POST',
		redirect: 'manual',
		headers: {
			cookie: cookies.sales,
			origin: server.url,
			'content-type': 'application/x-www-form-urlencoded'
		},
		body: ''
	});
	if (started.status !== 200) throw new Error(`visit start: ${started.status}`);
	ids.photo = (
		await uploadPhoto(server.url, prep.ownerToken, ids.estimate, 'access-matrix.jpg')
	).photo.id;
	// A second job, closed by the owner, so the final invoice's pay page has a live link.
	const closing = await scheduleViaForm(server.url, cookies.owner, {
		estimateId: await acceptedEstimate(server.url, prep.ownerToken, site),
		date: localToday(),
		crewIds: [crew[DEMO.crew]]
	});
	const closed = await postAction(server.url, cookies.owner, `/crew/${closing}?/done`, {
		reason: 'Closed for the access matrix, with no photos'
	});
	if (closed.type !== 'success') throw new Error(`done: ${closed.status} ${closed.data}`);
	const invoiceMail = fakes.smtp.messages().find((m) => /^Invoice \d+/.test(m.subject ?? ''));
	ids.invoiceToken = /\/i\/([A-Za-z0-9_-]{43})/.exec(invoiceMail?.text ?? '')?.[1] ?? '';
	if (!ids.invoiceToken) throw new Error('No invoice e-mail with a pay link.');
	// Send its proposal and accept it, so the customer's page and its actions have a live link
	// (an accepted one: a probe body can then neither accept nor decline it).
	const form = (path: string, cookie: string | null, fields: Record<string, string>) =>
		fetch(server.url + path, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				'content-type': 'application/x-www-form-urlencoded',
				origin: server.url,
				'x-forwarded-for': '10.9.9.9',
				...(cookie ? { cookie } : {})
			},
			body: new URLSearchParams(fields).toString()
		}).then(async (r) => ({ status: r.status, text: await r.text() }));
	// Its own estimate: the one the matrix opens keeps an open site visit for the visit's actions.
	const proposed = (
		await post('/api/estimates', { ...sceneRequest(site.houseId!), siteId: site.id, save: true })
	).estimate.id;
	// Its visit has a photo marked for the customer, so the proposal's photo route has a real id.
	const visit = await form(`/estimates/${proposed}/visit?/start`, cookies.sales, {});
	if (visit.status !== 200) throw new Error(`visit start: ${visit.status}`);
	ids.proposalPhoto = (
		await uploadPhoto(server.url, prep.ownerToken, proposed, 'for-customer.jpg')
	).photo.id;
	const marked = await form(`/estimates/${proposed}/visit?/photo`, cookies.sales, {
		photoId: ids.proposalPhoto,
		forProposal: 'true'
	});
	if (marked.status !== 200) throw new Error(`visit photo: ${marked.status}`);
	const ready = await fetch(`${server.url}/api/estimates/${proposed}`, {
		method: 'PATCH',
		headers: {
			authorization: `Bearer ${prep.ownerToken}`,
			'content-type': 'application/json'
		},
		body: JSON.stringify({ status: 'ready' })
	});
	if (ready.status !== 200) throw new Error(`ready: ${ready.status}`);
	const validUntil = new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10);
	const sent = await form(`/estimates/${proposed}/proposal?/send`, cookies.sales, {
		to: 'access.matrix@wrenfield.example',
		validUntil
	});
	if (sent.status !== 200) throw new Error(`send: ${sent.status}`);
	ids.token = linkIn(
		fakes.smtp.messages().find((m) => m.to.includes('access.matrix@wrenfield.example'))?.text ??
			null
	).split('/p/')[1];
	const accepted = await form(`/p/${ids.token}?/accept`, null, {
		fullName: 'Marisol Quenby',
		consent: 'yes'
	});
	if (accepted.status !== 200) throw new Error(`accept: ${accepted.status}`);
});
afterAll(async () => {
	await server?.stop();
	await fakes?.stop();
});

describe('the access matrix', () => {
	it('has an expected answer for every route under src/routes, and no more', () => {
		expect(routes.map((r) => r.pattern).filter((p) => !(p in EXPECTED))).toEqual([]);
		expect(Object.keys(EXPECTED).filter((p) => !routes.some((r) => r.pattern === p))).toEqual([]);
	});

	it('answers every route, method and caller as the table expects', async () => {
		const rows: string[] = [];
		const wrong: string[] = [];
		for (const cell of CELLS) {
			const line: string[] = [];
			const path = cell.path();
			for (const caller of CALLERS) {
				const headers: Record<string, string> = {
					accept: cell.route.methods.length && !cell.route.page ? 'application/json' : 'text/html',
					origin: server.url,
					'x-forwarded-for': `10.8.${CELLS.indexOf(cell)}.${CALLERS.indexOf(caller) + 1}`,
					...(await authFor(caller, cell))
				};
				if (cell.body !== undefined) {
					headers['content-type'] = cell.form
						? 'application/x-www-form-urlencoded'
						: 'application/json';
				}
				const res = await fetch(server.url + path, {
					method: cell.method,
					redirect: 'manual',
					headers,
					body: cell.body
				});
				await res.arrayBuffer();
				const got = outcomeOf(res.status, res.headers.get('location'));
				const want = expected(cell, caller);
				line.push(`${caller}=${res.status}${got === want ? '' : ` (want ${want})`}`);
				if (got !== want)
					wrong.push(`${cell.method} ${path} as ${caller}: ${res.status}, want ${want}`);
			}
			rows.push(`${cell.method.padEnd(6)} ${path}\n    ${line.join('  ')}`);
		}
		if (wrong.length) console.log(`Access matrix:\n${rows.join('\n')}`);
		expect(wrong).toEqual([]);
	});

	it('answers paths that lead to no route: sign-in or 401 when signed out, 404 when signed in', async () => {
		const wrong: string[] = [];
		const paths = ['/new-thing', '/api/new-thing', '/sites/not-an-id', '/api/team/export'];
		for (const p of paths) {
			for (const caller of CALLERS) {
				const signedOut = ['anonymous', 'revoked token', 'deactivated user'].includes(caller);
				const want = signedOut ? (p.startsWith('/api/') ? 401 : 303) : 404;
				const res = await fetch(server.url + p, {
					redirect: 'manual',
					headers: {
						accept: p.startsWith('/api/') ? 'application/json' : 'text/html',
						...(await authFor(caller, {
							route: routes[0],
							method: 'GET',
							path: () => p,
							form: false
						}))
					}
				});
				await res.arrayBuffer();
				if (res.status !== want) wrong.push(`GET ${p} as ${caller}: ${res.status}, want ${want}`);
			}
		}
		expect(wrong).toEqual([]);
	});
});
