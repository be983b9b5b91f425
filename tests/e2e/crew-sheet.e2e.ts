// The crew's day in Chromium against the built server and the local mail and payment fakes:
// the owner schedules an accepted, deposit-paid estimate on the Schedule page, the crew opens
// its sheet at 390 px, the connection drops (Playwright's offline mode), ticks and chemical used
// are kept on the phone through a reload while offline, and are sent when the connection
// returns; an after photo is added and the job marked done; the customer pays the final
// invoice on the payment fake's page, and the owner finds the job paid in the Reports. The batch recipe the sheet
// recomputes for a measured stock strength is checked against C1·V1 = C2·V2 (the dilution
// equation; worked examples in docs/estimating-model.md §5), computed here independently.
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, signInAs } from '../helpers/browser';
import fs from 'node:fs';
import path from 'node:path';
import { planFacetsOf } from '../../geodata/scene';
import { startTestFakes, type TestFakes } from '../helpers/fakes';
import { sessionFor } from '../helpers/http';
import { getJob, type JobReply } from '../helpers/jobs';
import { jpegWithGps } from '../helpers/photo-fixtures';
import { depositPaidEstimate } from '../helpers/proposal';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { prepareDataDir, type Prepared } from '../integration/api-helpers';

let server: TestServer;
let prep: Prepared;
let office: BrowserContext;
let phone: BrowserContext;
let estimateId = '';
let jobId = '';
let address = '';
let fakes: TestFakes;
let photoFile = '';
/** The Reports' pipeline rows before the job was closed, by status label: [count, value]. */
let pipelineBefore: Record<string, [string, string]> = {};

beforeAll(async () => {
	const dir = seededDataDir('e2e-crew-sheet');
	prep = await prepareDataDir(dir);
	fakes = await startTestFakes();
	server = await startServer(dir, fakes.env);
	fakes.payments.setWebhookUrl(`${server.url}/api/payments/webhook`);
	const site = prep.sites.find((s) => s.houseId === 'h04')!;
	address = site.address;
	const sales = await sessionFor(server.url, 'sales');
	estimateId = (await depositPaidEstimate(server.url, prep, 'h04', sales, fakes)).id;
	photoFile = path.resolve('tmp', `e2e-crew-${process.pid}`, 'north slope clean.jpg');
	fs.mkdirSync(path.dirname(photoFile), { recursive: true });
	const [lon, lat] = planFacetsOf('h04')[0].geometry.coordinates[0][0];
	fs.writeFileSync(photoFile, await jpegWithGps(640, 480, '#6d6a63', { lat, lon }));
	office = await openBrowser({ width: 1280, height: 900 });
	phone = await openBrowser({ width: 390, height: 844 });
}, 120_000);
afterAll(async () => {
	await office?.close();
	await phone?.close();
	await server?.stop();
	await fakes?.stop();
	if (photoFile) fs.rmSync(path.dirname(photoFile), { recursive: true, force: true });
});

async function pipeline(page: Page): Promise<Record<string, [string, string]>> {
	await page.goto(`${server.url}/reports`);
	const rows = await page
		.getByTestId('report-pipeline')
		.locator('tbody tr')
		.evaluateAll((trs) =>
			trs.map((tr) => [...tr.querySelectorAll('th, td')].map((c) => c.textContent!.trim()))
		);
	return Object.fromEntries(rows.map((r) => [r[0], [r[1], r[2]] as [string, string]]));
}

const checked = (page: Page, key: string) =>
	page.locator(`[data-testid="tick"][data-key="${key}"]`).isChecked();

async function syncState(page: Page, state: string) {
	await page.waitForFunction(
		(s) => document.querySelector('[data-testid="sync-state"]')?.getAttribute('data-state') === s,
		state,
		{ timeout: 30_000 }
	);
}

describe('crew sheet', () => {
	it('the owner schedules the accepted estimate on the Schedule page', async () => {
		const page = office.pages()[0] ?? (await office.newPage());
		await signInAs(page, server.url, DEMO.owner);
		pipelineBefore = await pipeline(page);
		await page.goto(`${server.url}/schedule?estimate=${estimateId}`);
		const select = page.locator('select[name="estimateId"]');
		expect(await select.inputValue()).toBe(estimateId);
		await page.getByRole('checkbox', { name: 'Jonah Reyes-Whitfield' }).check();
		await page.getByRole('button', { name: 'Schedule', exact: true }).click();
		await page.getByText(/^Scheduled\./).waitFor();
		const card = page.getByTestId('week-job').filter({ hasText: address });
		await card.waitFor();
		jobId = (await card.getAttribute('data-job'))!;
		expect(jobId).toMatch(/^[0-9a-f-]{36}$/);
	});

	it('opens at 390 px for the crew, keeps ticks through an offline reload, and sends them', async () => {
		const page = phone.pages()[0] ?? (await phone.newPage());
		await signInAs(page, server.url, DEMO.crew);
		await page.goto(`${server.url}/crew`);
		await page.getByTestId('sheet-link').filter({ hasText: address }).click();
		await page.getByTestId('sheet-address').waitFor();
		expect(await page.getByTestId('sheet-address').textContent()).toBe(address);
		// Nothing wider than the phone: the sheet reads without sideways scrolling.
		expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
			390
		);
		await expect(page.getByText('Safety cautions').isVisible()).resolves.toBe(true);

		// The service worker is running and has kept this sheet.
		await page.evaluate(() => navigator.serviceWorker.ready.then(() => undefined));
		await page.waitForFunction(
			() =>
				caches
					.open('crew-sheets')
					.then((c) => c.match(location.pathname))
					.then(Boolean),
			undefined,
			{ polling: 250, timeout: 30_000 }
		);

		// Chromium's offline emulation reaches each target in its own time (and a reloaded page
		// can send its first requests before it does), so the log's PUT is also kept off the
		// network by a route for the whole offline stretch: nothing the page sends gets through.
		let held = 0;
		await phone.route('**/api/jobs/*/log', (route) => {
			held++;
			return route.abort('internetdisconnected');
		});
		await phone.setOffline(true);
		// Wait until the emulation reaches every target (page and service worker): a GET the
		// worker passes through, and a POST that goes straight from the page, both fail only
		// from then on.
		await page.waitForFunction(
			() =>
				Promise.all(
					[{ cache: 'no-store' as const }, { method: 'POST', cache: 'no-store' as const }].map(
						(init) =>
							fetch('/api/health', init).then(
								() => false,
								() => true
							)
					)
				).then((failed) => failed.every(Boolean)),
			undefined,
			{ polling: 200, timeout: 10_000 }
		);
		for (const key of ['prewet', 'cover', 'testspot']) {
			await page.locator(`[data-testid="tick"][data-key="${key}"]`).check();
		}
		await page.getByTestId('stock-used').fill('7.5');
		await page.getByTestId('surfactant-used').fill('60');
		await syncState(page, 'pending');
		expect(await page.getByTestId('sync-state').textContent()).toMatch(/Not yet sent/);
		// Let the last keystrokes reach the phone's store before the reload.
		await page.waitForTimeout(800);

		// The page did try to send, and was held back.
		expect(held).toBeGreaterThan(0);
		await page.reload();
		await page.getByTestId('sheet-address').waitFor();
		expect(
			await page.evaluate(() =>
				fetch('/api/health', { cache: 'no-store' }).then(
					() => 'reached',
					() => 'failed'
				)
			),
			'still offline after the reload'
		).toBe('failed');
		await page.waitForFunction(
			() =>
				(document.querySelector('[data-key="prewet"]') as HTMLInputElement | null)?.checked === true
		);
		for (const key of ['prewet', 'cover', 'testspot']) expect(await checked(page, key)).toBe(true);
		expect(await checked(page, 'rinse')).toBe(false);
		expect(await page.getByTestId('stock-used').inputValue()).toBe('7.5');
		expect(await page.getByTestId('surfactant-used').inputValue()).toBe('60');
		await syncState(page, 'pending');
		// Nothing has reached the server yet.
		expect((await getJob<JobReply>(server.url, prep.ownerToken, jobId)).log).toBeNull();

		await phone.unroute('**/api/jobs/*/log');
		await phone.setOffline(false);
		await syncState(page, 'sent');
		const log = (await getJob<JobReply>(server.url, prep.ownerToken, jobId)).log!;
		expect(log.checklist).toEqual({ prewet: true, cover: true, testspot: true });
		expect(log.stockGalUsed).toBe(7.5);
		expect(log.surfactantOzUsed).toBe(60);
	});

	it('recomputes the batches for the stock strength measured on the day (C1·V1 = C2·V2)', async () => {
		const page = phone.pages()[0];
		const est = (await (
			await fetch(`${server.url}/api/estimates/${estimateId}`, {
				headers: { authorization: `Bearer ${prep.ownerToken}` }
			})
		).json()) as { result: { chemistry: { batches: { strengthPct: number; mixGal: number }[] } } };
		await page.getByTestId('measured-stock').fill('10');
		await page.getByTestId('recipe-basis').filter({ hasText: 'measured at 10.0%' }).waitFor();
		const shown = await page.getByTestId('batch-stock').allInnerTexts();
		// V1 = C2·V2 / C1: gallons of 10% stock for each batch's strength and volume.
		const want = est.result.chemistry.batches.map((b) =>
			((b.strengthPct * b.mixGal) / 10).toFixed(1)
		);
		expect(shown).toEqual(want);
		// The measured strength is part of the log and reaches the server like a tick.
		await expect
			.poll(
				async () =>
					(await getJob<JobReply>(server.url, prep.ownerToken, jobId)).log!.measuredStockPct,
				{
					timeout: 15_000
				}
			)
			.toBe(10);
	});

	it('adds an after photo and marks the job done with the checklist complete', async () => {
		const page = phone.pages()[0];
		await page.getByTestId('photo-files').setInputFiles(photoFile);
		await page.waitForSelector('[data-testid="uploads"] li[data-state="done"]');
		await page.getByRole('img', { name: 'After photo north slope clean.jpg' }).waitFor();
		await page.getByText('(1 so far)').waitFor();
		for (const box of await page.locator('[data-testid="tick"]').all()) {
			if (!(await box.isChecked())) await box.check();
		}
		await syncState(page, 'sent');
		await page.getByRole('button', { name: 'Mark job done' }).click();
		await page.getByText(/Marked done\./).waitFor();
		expect((await getJob<JobReply>(server.url, prep.ownerToken, jobId)).status).toBe('done');
	});

	it('the customer pays the final invoice on the payment fake; the owner finds it paid', async () => {
		const mail = fakes.smtp
			.messages()
			.find(
				(m) => m.to.includes('h04.deposit@wrenfield.example') && /^Invoice/.test(m.subject ?? '')
			);
		expect(mail, 'the final invoice e-mail').toBeTruthy();
		const link = /https?:\/\/[^\s/]+\/i\/[A-Za-z0-9_-]{43}/.exec(mail!.text ?? '')![0];
		expect(mail!.html).toContain(link);
		const customer = await openBrowser({ width: 390, height: 844 });
		try {
			const page = customer.pages()[0] ?? (await customer.newPage());
			await page.goto(link);
			const due = await page.getByTestId('invoice-due').innerText();
			await page.getByRole('button', { name: `Pay ${due} by card` }).click();
			await page.waitForURL(`${fakes.payments.url}/pay/**`);
			await page.getByRole('button', { name: /^Pay / }).click();
			await page.waitForURL(`${link}?payment=paid`);
			await page.getByTestId('invoice-paid').waitFor();
			expect(await page.getByTestId('invoice-paid').innerText()).toContain(due);
			expect(fakes.payments.sessions().at(-1)!.amount_total).toBe(
				Math.round(Number(due.replace(/[$,]/g, '')) * 100)
			);
		} finally {
			await customer.close();
		}
		expect((await getJob<JobReply>(server.url, prep.ownerToken, jobId)).status).toBe('paid');

		// The owner's Reports: one more estimate paid and one fewer scheduled, with its value.
		const page = office.pages()[0];
		const after = await pipeline(page);
		const n = (t: Record<string, [string, string]>, k: string) => Number(t[k]?.[0] ?? 0);
		expect(n(after, 'Paid')).toBe(n(pipelineBefore, 'Paid') + 1);
		expect(n(after, 'Accepted')).toBe(n(pipelineBefore, 'Accepted') - 1);
		const est = (await (
			await fetch(`${server.url}/api/estimates/${estimateId}`, {
				headers: { authorization: `Bearer ${prep.ownerToken}` }
			})
		).json()) as { status: string; result: { price: { totalCents: number } } };
		expect(est.status).toBe('paid');
		const cents = (v: string | undefined) =>
			Math.round(Number((v ?? '0').replace(/[$,]/g, '')) * 100);
		expect(cents(after.Paid[1]) - cents(pipelineBefore.Paid?.[1])).toBe(
			est.result.price.totalCents
		);
		await page.goto(`${server.url}/estimates/${estimateId}`);
		expect(await page.getByTestId('balance-paid').innerText()).toContain('Paid by card');
	});
});
