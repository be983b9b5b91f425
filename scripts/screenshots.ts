// Takes screenshots of the main screens for review: `npx tsx scripts/screenshots.ts [baseUrl] [paths…]`.
import fs from 'node:fs';
import { openBrowser } from '../tests/helpers/browser';
import { DEMO, DEMO_PASSWORD } from '../tests/helpers/server';

const base = process.argv[2] ?? 'http://localhost:3000';
const extra = process.argv.slice(3);
const out = 'screenshots';
fs.mkdirSync(out, { recursive: true });

for (const width of [1280, 768, 390]) {
	const ctx = await openBrowser({ width, height: width === 390 ? 844 : 900 });
	const page = ctx.pages()[0] ?? (await ctx.newPage());
	await page.goto(`${base}/sign-in`);
	await page.screenshot({ path: `${out}/sign-in-${width}.png`, fullPage: true });
	for (const [role, email] of Object.entries(DEMO)) {
		await ctx.clearCookies();
		await page.goto(`${base}/sign-in`);
		await page.fill('input[name=email]', email);
		await page.fill('input[name=password]', DEMO_PASSWORD);
		await Promise.all([
			page.waitForURL((u) => !u.pathname.startsWith('/sign-in')),
			page.click('button[type=submit], form button')
		]);
		await page.screenshot({ path: `${out}/${role}-today-${width}.png`, fullPage: true });
		if (role === 'owner') {
			for (const p of ['/team', '/sites', ...extra]) {
				await page.goto(base + p);
				await page.waitForLoadState('networkidle');
				const name = p.replace(/[^a-z0-9]+/gi, '_').replace(/^_|_$/g, '') || 'root';
				await page.screenshot({ path: `${out}/${role}-${name}-${width}.png`, fullPage: true });
			}
		}
	}
	await ctx.close();
}
console.log(`Screenshots in ${out}/`);
