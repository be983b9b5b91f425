// Browser tests in Debian's Chromium: sign-in, the shell per role, and role refusals.
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser } from '../helpers/browser';
import {
	DEMO,
	DEMO_PASSWORD,
	seededDataDir,
	startServer,
	type TestServer
} from '../helpers/server';

let server: TestServer;
let ctx: BrowserContext;
let page: Page;

beforeAll(async () => {
	server = await startServer(seededDataDir('e2e-shell'));
	ctx = await openBrowser();
	page = ctx.pages()[0] ?? (await ctx.newPage());
});
afterAll(async () => {
	await ctx?.close();
	await server?.stop();
});

async function signInAs(email: string, password = DEMO_PASSWORD) {
	await ctx.clearCookies();
	await page.goto(`${server.url}/sign-in`);
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
}

const navOf = () => page.locator('#main-nav a').allInnerTexts();

const EXPECTED_NAV = {
	owner: [
		'Today',
		'Sites',
		'Estimates',
		'Schedule',
		'Crew sheets',
		'Rates',
		'Team',
		'Reports',
		'Import & export',
		'Settings',
		'Audit log'
	],
	estimator: ['Today', 'Sites', 'Estimates'],
	sales: ['Today', 'Sites', 'Estimates', 'Schedule'],
	crew: ['Today', 'Crew sheets']
} as const;

describe('the shell per role', () => {
	for (const role of ['owner', 'estimator', 'sales', 'crew'] as const) {
		it(`${role} signs in and sees only their own navigation`, async () => {
			await signInAs(DEMO[role]);
			await page.waitForURL(`${server.url}/`);
			expect(await page.locator('h1').innerText()).toBe('Today');
			expect((await navOf()).map((t) => t.trim())).toEqual(EXPECTED_NAV[role]);
			expect(await page.getByTestId('user-role').innerText()).toBe(
				role[0].toUpperCase() + role.slice(1)
			);
			expect(await page.getByTestId('company-name').innerText()).toBe(
				'Harbor & Pine Exterior Care'
			);
		});
	}
});

describe('sign-in failures and guards', () => {
	it('shows a clear message for a wrong password and creates no session', async () => {
		await signInAs(DEMO.estimator, 'definitely-wrong');
		const alert = page.getByRole('alert');
		await alert.waitFor();
		expect(await alert.innerText()).toContain('do not match an active account');
		expect(page.url()).toContain('/sign-in');
		const cookies = await ctx.cookies();
		expect(cookies.find((c) => c.name === 'cp_session' && c.value)).toBeUndefined();
		// The e-mail stays filled in so the user can retry.
		expect(await page.getByLabel('E-mail').inputValue()).toBe(DEMO.estimator);
	});

	it('sends a signed-out visit to an app page to sign-in, then back', async () => {
		await ctx.clearCookies();
		await page.goto(`${server.url}/sites`);
		expect(new URL(page.url()).pathname).toBe('/sign-in');
		await page.getByLabel('E-mail').fill(DEMO.sales);
		await page.getByLabel('Password').fill(DEMO_PASSWORD);
		await page.getByRole('button', { name: 'Sign in' }).click();
		await page.waitForURL(`${server.url}/sites`);
		expect(await page.locator('h1').innerText()).toBe('Sites');
	});

	it('gives crew a 403 on the Team page and on its API', async () => {
		await signInAs(DEMO.crew);
		await page.waitForURL(`${server.url}/`);
		const res = await page.goto(`${server.url}/team`);
		expect(res?.status()).toBe(403);
		expect(await page.content()).toContain("can't open this page");
		const api = await page.evaluate(async () => {
			const r = await fetch('/api/team');
			return { status: r.status, body: await r.json() };
		});
		expect(api.status).toBe(403);
		expect(api.body.message).toMatch(/role/);
	});
});
