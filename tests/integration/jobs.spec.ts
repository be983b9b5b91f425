// Scheduling and the crew's day against the built server on a fresh seeded PGlite: only an
// accepted estimate can be scheduled, a postponement keeps the history, crew see only their
// own sheets, the log refuses bad input and keeps the newest write, marking done needs the
// checklist and an after photo or a reason, and each schedule change e-mails the customer once.
// The rules are Clearpitch's own (issue 10); no outside source is involved.
import { openPglite } from '../helpers/pglite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEFAULT_RATE_CARD } from '../../src/lib/estimating/rate-card';
import { localToday, addDays } from '../../src/lib/jobs/week';
import { cardToForm } from '../../src/routes/(app)/rates/card-form';
import { sessionFor, signIn } from '../helpers/http';
import {
	acceptedEstimate,
	crewIds,
	getJob,
	postAction,
	scheduleViaForm,
	type JobReply
} from '../helpers/jobs';
import { seededDataDir, startServer, type TestServer } from '../helpers/server';
import { prepareDataDir, type Prepared } from './api-helpers';

let server: TestServer;
let dir: string;
let prep: Prepared;
const cookies = { owner: '', estimator: '', sales: '', crew: '', otherCrew: '' };
let crew: Record<string, string> = {};
const today = localToday();

const site = (houseId: string) => prep.sites.find((s) => s.houseId === houseId)!;

beforeAll(async () => {
	dir = seededDataDir('jobs');
	prep = await prepareDataDir(dir);
	// Customers get invented addresses so the schedule e-mails have somewhere to go.
	const db = openPglite(dir);
	await db.waitReady;
	await db.query(
		`update customers set email = lower(regexp_replace(name, '[^A-Za-z]+', '.', 'g')) || '@customers.example'`
	);
	await db.close();
	server = await startServer(dir);
	for (const r of ['owner', 'estimator', 'sales', 'crew'] as const)
		cookies[r] = await sessionFor(server.url, r);
	// A second technician, not on the jobs below.
	const invite = await postAction(server.url, cookies.owner, '/team?/invite', {
		name: 'Ines Calloway',
		email: 'ines.calloway@harborpine.example',
		role: 'crew',
		password: 'another-crew-password'
	});
	expect(invite.type).toBe('success');
	cookies.otherCrew = (
		await signIn(server.url, 'ines.calloway@harborpine.example', 'another-crew-password')
	).cookie!;
	crew = await crewIds(server.url, prep.ownerToken);
}, 120_000);
afterAll(async () => server?.stop());

const jonah = () => crew['crew@harborpine.example'];
const ines = () => crew['ines.calloway@harborpine.example'];
const job = (id: string) => getJob<JobReply>(server.url, prep.ownerToken, id);
const estimateStatus = async (id: string) => {
	const r = await fetch(`${server.url}/api/estimates/${id}`, {
		headers: { authorization: `Bearer ${prep.ownerToken}` }
	});
	return ((await r.json()) as { status: string }).status;
};
const putLog = (id: string, cookie: string, body: unknown) =>
	fetch(`${server.url}/api/jobs/${id}/log`, {
		method: 'PUT',
		headers: {
			cookie,
			origin: server.url,
			'content-type': 'application/json',
			accept: 'application/json'
		},
		body: JSON.stringify(body)
	});
const log = (over: Record<string, unknown> = {}) => ({
	checklist: { prewet: true },
	stockGalUsed: 4.5,
	surfactantOzUsed: 40,
	measuredStockPct: 11.5,
	notes: 'Moss heavy by the chimney.',
	clientUpdatedAt: new Date().toISOString(),
	...over
});

describe('scheduling', () => {
	it('schedules only an accepted estimate, once', async () => {
		const draft = await fetch(`${server.url}/api/estimates`, {
			method: 'POST',
			headers: { authorization: `Bearer ${prep.ownerToken}`, 'content-type': 'application/json' },
			body: JSON.stringify({
				...(await import('./api-helpers')).sceneRequest('h02'),
				siteId: site('h02').id,
				save: true
			})
		}).then((r) => r.json() as Promise<{ estimate: { id: string } }>);
		const fields = {
			estimateId: draft.estimate.id,
			date: today,
			windowStart: '08:00',
			windowEnd: '10:00',
			crewIds: [jonah()]
		};
		const refused = await postAction(server.url, cookies.owner, '/schedule?/schedule', fields);
		expect(refused.status).toBe(409);
		expect(refused.data).toMatch(/Only an accepted estimate can be scheduled; this one is draft/);
		expect(await estimateStatus(draft.estimate.id)).toBe('draft');

		const est = await acceptedEstimate(server.url, prep.ownerToken, site('h04'));
		const id = await scheduleViaForm(server.url, cookies.sales, {
			estimateId: est,
			date: today,
			crewIds: [jonah()]
		});
		expect(await estimateStatus(est)).toBe('scheduled');
		const j = await job(id);
		expect(j).toMatchObject({ status: 'scheduled', date: today, revision: 1, crewIds: [jonah()] });
		expect(j.history.map((h) => h.kind)).toEqual(['scheduled']);

		const again = await postAction(server.url, cookies.owner, '/schedule?/schedule', {
			...fields,
			estimateId: est
		});
		expect(again.status).toBe(409);
	});

	it('lets owner and sales schedule, and nobody else', async () => {
		for (const role of ['estimator', 'crew'] as const) {
			const r = await postAction(server.url, cookies[role], '/schedule?/schedule', {});
			expect(r.status, role).toBe(403);
		}
	});

	it('refuses crew that are not crew members, and bad windows, with a field message', async () => {
		const est = await acceptedEstimate(server.url, prep.ownerToken, site('h05'));
		const owner = (await (
			await fetch(`${server.url}/api/me`, {
				headers: { authorization: `Bearer ${prep.ownerToken}` }
			})
		).json()) as { id: string };
		const notCrew = await postAction(server.url, cookies.owner, '/schedule?/schedule', {
			estimateId: est,
			date: today,
			windowStart: '08:00',
			windowEnd: '10:00',
			crewIds: [owner.id]
		});
		expect(notCrew.status).toBe(400);
		expect(notCrew.data).toMatch(/crew role/);
		const backwards = await postAction(server.url, cookies.owner, '/schedule?/schedule', {
			estimateId: est,
			date: today,
			windowStart: '10:00',
			windowEnd: '08:00',
			crewIds: [jonah()]
		});
		expect(backwards.status).toBe(400);
		expect(backwards.data).toMatch(/end after it starts/);
		expect(await estimateStatus(est)).toBe('accepted');
	});
});

describe('moving and postponing', () => {
	let id = '';
	beforeAll(async () => {
		const est = await acceptedEstimate(server.url, prep.ownerToken, site('h06'));
		id = await scheduleViaForm(server.url, cookies.owner, {
			estimateId: est,
			date: today,
			crewIds: [jonah()]
		});
	});

	it('moves a job and keeps where it was in the history', async () => {
		const to = addDays(today, 2);
		const r = await postAction(server.url, cookies.sales, '/schedule?/move', {
			jobId: id,
			revision: '1',
			date: to,
			windowStart: '12:00',
			windowEnd: '13:00',
			crewIds: [jonah(), ines()]
		});
		expect(r.type).toBe('success');
		const j = await job(id);
		expect(j).toMatchObject({ date: to, revision: 2, crewIds: [jonah(), ines()] });
		expect(j.history.map((h) => [h.kind, h.from?.date ?? null])).toEqual([
			['scheduled', null],
			['moved', today]
		]);
	});

	it('refuses a move drawn from an old revision, changing nothing', async () => {
		const before = await job(id);
		const r = await postAction(server.url, cookies.owner, '/schedule?/move', {
			jobId: id,
			revision: '1',
			date: addDays(today, 5),
			windowStart: '08:00',
			windowEnd: '09:00',
			crewIds: [jonah()]
		});
		expect(r.status).toBe(409);
		expect(await job(id)).toEqual(before);
	});

	it('postpones for a reason with no date, then to a new date, losing nothing', async () => {
		const p1 = await postAction(server.url, cookies.owner, '/schedule?/postpone', {
			jobId: id,
			revision: '2',
			reason: 'Rain forecast all morning',
			newDate: ''
		});
		expect(p1.type).toBe('success');
		let j = await job(id);
		expect(j).toMatchObject({ status: 'postponed', date: null, revision: 3 });
		const p2 = await postAction(server.url, cookies.owner, '/schedule?/postpone', {
			jobId: id,
			revision: '3',
			reason: 'Customer asked for the following week',
			newDate: addDays(today, 7)
		});
		expect(p2.type).toBe('success');
		j = await job(id);
		expect(j).toMatchObject({ status: 'scheduled', date: addDays(today, 7), revision: 4 });
		expect(j.history.map((h) => [h.kind, h.from?.date ?? null, h.date, h.reason ?? null])).toEqual([
			['scheduled', null, today, null],
			['moved', today, addDays(today, 2), null],
			['postponed', addDays(today, 2), null, 'Rain forecast all morning'],
			['postponed', null, addDays(today, 7), 'Customer asked for the following week']
		]);
	});

	it('refuses a postponement without a real reason', async () => {
		const r = await postAction(server.url, cookies.owner, '/schedule?/postpone', {
			jobId: id,
			revision: '4',
			reason: 'rain'
		});
		expect(r.status).toBe(400);
		expect((await job(id)).revision).toBe(4);
	});
});

describe('crew sheets and the log', () => {
	let id = '';
	let est = '';
	beforeAll(async () => {
		est = await acceptedEstimate(server.url, prep.ownerToken, site('h07'));
		id = await scheduleViaForm(server.url, cookies.owner, {
			estimateId: est,
			date: today,
			crewIds: [jonah()]
		});
	});

	it('opens a sheet to its own crew and the owner; other crew get 404', async () => {
		const get = (cookie: string) =>
			fetch(`${server.url}/crew/${id}`, { headers: { cookie }, redirect: 'manual' }).then(
				(r) => r.status
			);
		expect(await get(cookies.crew)).toBe(200);
		expect(await get(cookies.owner)).toBe(200);
		expect(await get(cookies.otherCrew)).toBe(404);
		expect(await get(cookies.sales)).toBe(403);
		expect((await putLog(id, cookies.otherCrew, log())).status).toBe(404);
		const list = await (
			await fetch(`${server.url}/crew`, { headers: { cookie: cookies.otherCrew } })
		).text();
		expect(list).not.toContain(`/crew/${id}`);
		const mine = await (
			await fetch(`${server.url}/crew`, { headers: { cookie: cookies.crew } })
		).text();
		expect(mine).toContain(`/crew/${id}`);
	});

	it('stores the log, refuses bad bodies with 400, and keeps the newest write', async () => {
		const first = log({ clientUpdatedAt: '2026-12-03T10:00:00.000Z' });
		const ok = await putLog(id, cookies.crew, first);
		expect(ok.status).toBe(200);
		expect(((await ok.json()) as { stored: boolean }).stored).toBe(true);
		for (const bad of [
			{ ...first, stockGalUsed: -2 },
			{ ...first, stockGalUsed: 'NaN' },
			{ ...first, measuredStockPct: 99 },
			{ ...first, checklist: { prewet: 'yes' } },
			{ ...first, notes: 'a\u0000b' },
			{ ...first, doneReason: 'no' },
			{ checklist: {} }
		]) {
			const r = await putLog(id, cookies.crew, bad);
			expect(r.status, JSON.stringify(bad).slice(0, 80)).toBe(400);
		}
		const stale = await putLog(
			id,
			cookies.crew,
			log({ checklist: {}, clientUpdatedAt: '2026-12-03T09:00:00.000Z' })
		);
		expect(((await stale.json()) as { stored: boolean }).stored).toBe(false);
		expect((await job(id)).log).toMatchObject({
			checklist: { prewet: true },
			stockGalUsed: 4.5,
			measuredStockPct: 11.5
		});
	});

	it('refuses mark done without the checklist, photo or a reason; done with a reason', async () => {
		const done = (reason?: string) =>
			postAction(
				server.url,
				cookies.crew,
				`/crew/${id}?/done`,
				reason === undefined ? {} : { reason }
			);
		const none = await done();
		expect(none.status).toBe(400);
		expect(none.data).toMatch(/Not done yet/);
		expect(none.data).toMatch(/At least one after photo/);
		expect((await done('too short')).status).toBe(400);

		// The whole checklist ticked: still no after photo, so still refused.
		const sheet = await (
			await fetch(`${server.url}/crew/${id}`, { headers: { cookie: cookies.crew } })
		).text();
		const keys = [...new Set([...sheet.matchAll(/data-key="([^"]+)"/g)].map((m) => m[1]))];
		expect(keys).toContain('walkround');
		const full = await putLog(
			id,
			cookies.crew,
			log({
				checklist: Object.fromEntries(keys.map((k) => [k, true])),
				clientUpdatedAt: '2026-12-03T11:00:00.000Z'
			})
		);
		expect(((await full.json()) as { stored: boolean }).stored).toBe(true);
		const noPhoto = await done();
		expect(noPhoto.status).toBe(400);
		expect(noPhoto.data).toMatch(/At least one after photo/);
		expect(noPhoto.data).not.toMatch(/Walk-round/);
		expect(await estimateStatus(est)).toBe('scheduled');

		const closed = await done('After photos sent to the office by text');
		expect(closed.type).toBe('success');
		expect(await estimateStatus(est)).toBe('done');
		const j = await job(id);
		expect(j.status).toBe('done');
		expect(j.log?.doneReason).toBe('After photos sent to the office by text');
		expect(j.history.map((h) => h.kind)).toEqual(['scheduled', 'done']);

		// Closed means closed: no more log changes, moves or a second close.
		expect((await putLog(id, cookies.crew, log())).status).toBe(409);
		const move = await postAction(server.url, cookies.owner, '/schedule?/move', {
			jobId: id,
			revision: '1',
			date: today,
			windowStart: '08:00',
			windowEnd: '10:00',
			crewIds: [jonah()]
		});
		expect(move.status).toBe(409);
		expect((await done('After photos sent to the office by text')).status).toBe(409);
	});
});

describe("the sheet's dwell limit follows the estimate's rate card", () => {
	// The trade's ceiling is "≤ 12–15 min" a coat (common practice, no outside source); the owner
	// may set less on Rates. The sheet shows the setting of the card the estimate was priced with.
	const dwellLine = async (jobId: string) => {
		const html = await (
			await fetch(`${server.url}/crew/${jobId}`, { headers: { cookie: cookies.crew } })
		).text();
		return /Dwell at most <strong>(\d+) min a coat<\/strong>/.exec(html)?.[1];
	};

	it("shows 15 min from the default card, the owner's 10 min on a later card, and refuses 20", async () => {
		const before = await acceptedEstimate(server.url, prep.ownerToken, site('h08'));
		const beforeJob = await scheduleViaForm(server.url, cookies.owner, {
			estimateId: before,
			date: addDays(today, 1),
			crewIds: [jonah()]
		});
		expect(await dwellLine(beforeJob)).toBe('15');

		const values = cardToForm(DEFAULT_RATE_CARD);
		expect(values['chemistry.dwellMinutes']).toBe('15');
		const tooLong = await postAction(server.url, cookies.owner, '/rates?/save', {
			...values,
			'chemistry.dwellMinutes': '20'
		});
		expect(tooLong.status).toBe(400);
		// The Rates form puts the message beside the field it names.
		expect(tooLong.data).toContain('"chemistry.dwellMinutes"');
		expect(tooLong.data).toContain('Must be at most 15 min');
		const saved = await postAction(server.url, cookies.owner, '/rates?/save', {
			...values,
			'chemistry.dwellMinutes': '10',
			note: 'Shorter dwell for the summer'
		});
		expect(saved.type).toBe('redirect');

		const after = await acceptedEstimate(server.url, prep.ownerToken, site('h09'));
		const afterJob = await scheduleViaForm(server.url, cookies.owner, {
			estimateId: after,
			date: addDays(today, 1),
			crewIds: [jonah()]
		});
		expect(await dwellLine(afterJob)).toBe('10');
		// The job priced with the earlier card keeps its figure.
		expect(await dwellLine(beforeJob)).toBe('15');
	});
});

describe('the customer e-mail', () => {
	it('writes one outbox message per schedule change, keyed by job and revision', async () => {
		await server.stop();
		const db = openPglite(dir);
		try {
			await db.waitReady;
			const rows = (
				await db.query<{ key: string; to: string; subject: string; body: string }>(
					`select idempotency_key as key, to_address as to, subject, text_body as body
					   from mail_outbox where subject_kind = 'job' order by created_at`
				)
			).rows;
			const jobsRows = (
				await db.query<{ id: string; revision: number }>('select id, revision from jobs')
			).rows;
			// One message per revision of every job, no more, no fewer.
			const want = jobsRows.flatMap((j) =>
				Array.from({ length: j.revision }, (_, i) => `job:${j.id}:r${i + 1}`)
			);
			expect(rows.map((r) => r.key).sort()).toEqual(want.sort());
			expect(rows.every((r) => r.to.endsWith('@customers.example'))).toBe(true);
			const postponed = rows.find((r) => r.body.includes('Rain forecast all morning'));
			expect(postponed?.subject).toMatch(/postponed/);
			expect(rows[0].body).toContain('Before the crew arrives, please:');
		} finally {
			await db.close();
			server = await startServer(dir);
		}
	});
});
