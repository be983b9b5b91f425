import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { DEMO_PASSWORD } from './server';

export const CHROMIUM = process.env.CHROMIUM_PATH || '/usr/bin/chromium';

/** Flags that give headless Chromium WebGL2 (SwiftShader) on a closed network. */
const ARGS = [
	'--headless=new',
	'--no-sandbox',
	'--disable-gpu',
	'--disable-quic',
	'--no-first-run',
	'--disable-background-networking',
	'--disable-component-update',
	'--disable-sync',
	'--enable-unsafe-swiftshader',
	'--use-angle=swiftshader'
];

export async function openBrowser(
	opts: { width?: number; height?: number; webgl?: boolean } = {}
): Promise<BrowserContext> {
	if (!fs.existsSync(CHROMIUM)) {
		throw new Error(`Chromium not found at ${CHROMIUM}: install the Debian package "chromium".`);
	}
	const tmp = path.resolve('tmp');
	fs.mkdirSync(tmp, { recursive: true });
	process.env.TMPDIR = tmp;
	const profile = fs.mkdtempSync(path.join(tmp, 'chromium-'));
	const args = opts.webgl === false ? [...ARGS, '--disable-webgl', '--disable-webgl2'] : ARGS;
	return chromium.launchPersistentContext(profile, {
		executablePath: CHROMIUM,
		args,
		viewport: { width: opts.width ?? 1280, height: opts.height ?? 860 },
		deviceScaleFactor: 1
	});
}

export function tmpRoot() {
	return path.resolve(os.tmpdir());
}

/** Signs in through the sign-in form and waits for the landing page (Today). */
export async function signInAs(
	page: Page,
	baseUrl: string,
	email: string,
	password = DEMO_PASSWORD
) {
	await page.goto(`${baseUrl}/sign-in`);
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await Promise.all([
		page.waitForURL(`${baseUrl}/`),
		page.getByRole('button', { name: 'Sign in' }).click()
	]);
}
