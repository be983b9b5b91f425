// From a priced estimate to a paid deposit, with real clicks in Chromium against the built server
// and the local SMTP and payment fakes: the site visit on a tablet with a photo uploaded and
// marked for the customer, confirmed so the estimate is ready; send the proposal, read the e-mail the SMTP fake received,
// open its private link as the customer on a phone-sized screen, tick an extra, accept with a
// typed name, pay on the fake's hosted page, and see the estimate accepted with the deposit paid.
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { money } from '../../src/lib/components/estimate/format';
import { pctOf } from '../../src/lib/estimating/money';
import { openBrowser, signInAs } from '../helpers/browser';
import { startTestFakes, type TestFakes } from '../helpers/fakes';
import fs from 'node:fs';
import path from 'node:path';
import { planFacetsOf } from '../../geodata/scene';
import { createWithToken } from '../helpers/http';
import { jpegWithGps } from '../helpers/photo-fixtures';
import { linkIn } from '../helpers/proposal';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { prepareDataDir, type Prepared } from '../integration/api-helpers';

let server: TestServer;
let fakes: TestFakes;
let prep: Prepared;
let office: BrowserContext;
let customer: BrowserContext;
let page: Page;
let estimate: { id: string; totalCents: number; depositCents: number };
let photoFile = '';

beforeAll(async () => {
	const dir = seededDataDir('e2e-proposal');
	prep = await prepareDataDir(dir);
	fakes = await startTestFakes();
	server = await startServer(dir, fakes.env);
	fakes.payments.setWebhookUrl(`${server.url}/api/payments/webhook`);
	// A priced estimate of h01 from its measured roof plan: the site visit makes it ready.
	const site = prep.sites.find((s) => s.houseId === 'h01')!;
	type Created = { plan: { id: string }; estimate: { id: string } };
	const plan = (
		await createWithToken<Created>(server.url, prep.ownerToken, '/api/roof-plans', {
			siteId: site.id,
			facets: planFacetsOf('h01'),
			baseVersion: null
		})
	).plan;
	const made = await createWithToken<Created>(server.url, prep.ownerToken, '/api/estimates', {
		roofPlanId: plan.id,
		siteId: site.id,
		save: true
	});
	estimate = { id: made.estimate.id, totalCents: 0, depositCents: 0 };
	photoFile = path.resolve('tmp', `e2e-proposal-${process.pid}`, 'front slope moss.jpg');
	fs.mkdirSync(path.dirname(photoFile), { recursive: true });
	const [lon, lat] = planFacetsOf('h01')[0].geometry.coordinates[0][0];
	fs.writeFileSync(photoFile, await jpegWithGps(800, 600, '#55704a', { lat, lon }));
	// A tablet for the visit; the same screen then sends the proposal.
	office = await openBrowser({ width: 768, height: 1024 });
	page = office.pages()[0] ?? (await office.newPage());
	await signInAs(page, server.url, DEMO.sales);
});
afterAll(async () => {
	await office?.close();
	await customer?.close();
	await server?.stop();
	await fakes?.stop();
	if (photoFile) fs.rmSync(path.dirname(photoFile), { recursive: true, force: true });
});

/**
 * Text whose contrast with the background behind it is under WCAG 2.2 SC 1.4.3 (AA): 4.5:1,
 * or 3:1 for large text (18.66 px bold or 24 px). Relative luminance and contrast ratio as WCAG
 * defines them (https://www.w3.org/TR/WCAG22/#dfn-relative-luminance, #dfn-contrast-ratio).
 */
async function contrastProblems(page: Page): Promise<string[]> {
	return page.evaluate(() => {
		const rgb = (c: string) => (c.match(/[\d.]+/g) ?? []).map(Number);
		const lum = ([r, g, b]: number[]) => {
			const f = (v: number) => {
				const s = v / 255;
				return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
			};
			return 0.2126 * f(r) + 0.7152 * f(g) + 0.0722 * f(b);
		};
		const bgOf = (el: Element | null): number[] => {
			for (let e = el; e; e = e.parentElement) {
				const c = rgb(getComputedStyle(e).backgroundColor);
				if (c.length === 3 || (c.length === 4 && c[3] > 0)) return c.slice(0, 3);
			}
			return [255, 255, 255];
		};
		const out: string[] = [];
		const walker = document.createTreeWalker(document.body, NodeFilter.SHOW_TEXT);
		for (let n = walker.nextNode(); n; n = walker.nextNode()) {
			const el = n.parentElement;
			if (!el || !n.textContent?.trim()) continue;
			const st = getComputedStyle(el);
			if (st.visibility === 'hidden' || st.display === 'none' || el.closest('.sr-only')) continue;
			// Only sRGB colours are measured; anything else is reported rather than guessed at.
			if (!st.color.startsWith('rgb')) {
				out.push(`unmeasured colour ${st.color}`);
				continue;
			}
			if (!(el as HTMLElement).offsetParent && st.position !== 'fixed') continue;
			const a = lum(rgb(st.color).slice(0, 3));
			const b = lum(bgOf(el));
			const ratio = (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);
			const size = parseFloat(st.fontSize);
			const large = size >= 24 || (size >= 18.66 && Number(st.fontWeight) >= 700);
			if (ratio < (large ? 3 : 4.5)) {
				out.push(`${ratio.toFixed(2)}:1 "${n.textContent.trim().slice(0, 40)}"`);
			}
		}
		return out;
	});
}

describe('proposal to deposit', () => {
	it('visits the site on a tablet: a photo for the customer, confirmed and re-priced', async () => {
		await page.goto(`${server.url}/estimates/${estimate.id}`);
		await page.getByRole('link', { name: 'Site visit' }).click();
		await page.waitForURL(`${server.url}/estimates/${estimate.id}/visit`);
		await page.getByRole('button', { name: 'Start the site visit' }).click();
		await page.getByTestId('visit-facet').first().waitFor();
		expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
			768
		);
		await page.getByTestId('photo-files').setInputFiles(photoFile);
		await page.waitForSelector('[data-testid="uploads"] li[data-state="done"]');
		await page.getByRole('img', { name: 'Photo front slope moss.jpg' }).waitFor();
		await page.getByRole('button', { name: 'Show on proposal' }).click();
		await page.getByRole('button', { name: '✓ On proposal' }).waitFor();
		await page.getByRole('button', { name: 'Confirm visit and re-price' }).click();
		await page.getByTestId('visit-confirmed').waitFor();
		expect(await page.getByTestId('status-badge').innerText()).toMatch(/ready/i);
		// The price the proposal offers is the estimate's as re-priced on site.
		const res = await fetch(`${server.url}/api/estimates/${estimate.id}`, {
			headers: { authorization: `Bearer ${prep.ownerToken}` }
		});
		const body = (await res.json()) as {
			status: string;
			result: { price: { totalCents: number; depositCents: number; measuredOnSite: boolean } };
		};
		expect(body.status).toBe('ready');
		expect(body.result.price.measuredOnSite).toBe(true);
		estimate.totalCents = body.result.price.totalCents;
		estimate.depositCents = body.result.price.depositCents;
	});

	it('sends, is accepted with an extra, and the deposit is paid', async () => {
		// The office sends the proposal.
		await page.goto(`${server.url}/estimates/${estimate.id}`);
		await page.getByRole('link', { name: 'Open proposal' }).click();
		await page.waitForURL(`**/estimates/${estimate.id}/proposal`);
		expect(await page.getByTestId('proposal-total').innerText()).toBe(money(estimate.totalCents));
		const to = page.getByLabel('Customer’s e-mail');
		expect(await to.inputValue()).toMatch(/@wrenfield\.example$/);
		await page.getByRole('button', { name: 'Send proposal' }).click();
		await page.getByText('Version 1 sent to').waitFor();
		await page.getByText('Delivered to the mail server').waitFor();

		// The e-mail, as the SMTP fake parsed it: text and HTML, both with the private link.
		const mails = fakes.smtp.messages();
		expect(mails).toHaveLength(1);
		const link = linkIn(mails[0].text);
		expect(mails[0].html).toContain(link);
		expect(link.startsWith(server.url)).toBe(true);

		// The customer, on a 390 px phone screen, with no account.
		customer = await openBrowser({ width: 390, height: 844 });
		const phone = customer.pages()[0] ?? (await customer.newPage());
		await phone.goto(link);
		await phone.getByRole('heading', { name: 'Accept this proposal' }).waitFor();
		expect(await phone.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
			390
		);
		expect(await contrastProblems(phone)).toEqual([]);
		// The photo the salesperson marked, served through the private link.
		const photo = phone.getByRole('img', { name: 'Site visit photo front slope moss.jpg' });
		await photo.scrollIntoViewIfNeeded();
		await phone.waitForFunction(
			() =>
				(
					document.querySelector(
						'img[alt="Site visit photo front slope moss.jpg"]'
					) as HTMLImageElement | null
				)?.naturalWidth === 800
		);
		await phone.setViewportSize({ width: 320, height: 700 });
		expect(await phone.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
			320
		);
		await phone.setViewportSize({ width: 390, height: 844 });
		const gutter = phone.getByRole('checkbox', { name: /Gutter brightening/ });
		const label = await phone.locator('label', { has: gutter }).innerText();
		const extraCents = Math.round(Number(/\+\$([\d,.]+)/.exec(label)![1].replace(/,/g, '')) * 100);
		await gutter.check();
		// The rate card's tax is 0% in the demo, so the total grows by the extra's price; the
		// deposit is the card's 25% of the new total (both as the estimating model rounds).
		const total = estimate.totalCents + extraCents;
		await phone.waitForFunction(
			(want) => document.querySelector('[data-testid="accept-total"]')?.textContent === want,
			money(total)
		);
		const deposit = pctOf(total, 25);
		expect(await phone.getByTestId('accept-deposit').innerText()).toBe(money(deposit));
		await phone.getByLabel('Your full name, as your signature').fill('Marisol Quenby');
		await phone.getByRole('checkbox', { name: /I agree to the work/ }).check();
		await phone.getByRole('button', { name: 'Accept proposal' }).click();
		await phone.getByRole('heading', { name: 'Accepted — thank you' }).waitFor();

		// Pay on the fake's hosted page; it signs a webhook to the app, then sends the customer back.
		await phone.getByRole('button', { name: `Pay deposit ${money(deposit)}` }).click();
		await phone.waitForURL(`${fakes.payments.url}/pay/**`);
		await phone.getByRole('button', { name: /^Pay / }).click();
		await phone.waitForURL(`${link}?deposit=paid`);
		expect(await phone.getByTestId('deposit-paid').innerText()).toContain(money(deposit));
		await phone.screenshot({ path: '/tmp/shots-proposal/customer-paid-390.png', fullPage: true });

		// The office sees the estimate accepted, with the deposit paid.
		await page.goto(`${server.url}/estimates/${estimate.id}`);
		expect(await page.getByTestId('status-badge').first().innerText()).toMatch(/Accepted/);
		expect(await page.getByTestId('panel-deposit').innerText()).toContain(`${money(deposit)} paid`);
		expect(fakes.payments.sessions()).toHaveLength(1);
		expect(fakes.payments.sessions()[0].amount_total).toBe(deposit);
	});
});
