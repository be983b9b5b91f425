// Screenshots of the roof editor and the Estimates list at 1280×800, 768×1024 and 390×844, against a
// freshly seeded test server (needs `npx vite build` first): `npx tsx scripts/editor-screenshots.ts`.
import fs from 'node:fs';
import { openBrowser, signInAs } from '../tests/helpers/browser';
import { house } from '../geodata/scene';
import { DEMO, seededDataDir, startServer } from '../tests/helpers/server';

const server = await startServer(seededDataDir('shots'));
const out = 'screenshots';
fs.mkdirSync(out, { recursive: true });
try {
	for (const [width, height] of [
		[1280, 800],
		[768, 1024],
		[390, 844]
	]) {
		const ctx = await openBrowser({ width, height });
		const page = ctx.pages()[0] ?? (await ctx.newPage());
		await signInAs(page, server.url, DEMO.estimator);
		const r = await page.request.get(`${server.url}/api/sites`);
		const { sites } = (await r.json()) as { sites: { id: string; address: string }[] };
		// A house the demo measured, so the editor opens on a real plan.
		const site = sites.find((s) => s.address === house('h04')!.properties.address)!;
		await page.goto(`${server.url}/sites/${site.id}/roof`);
		await page.waitForFunction(
			() => 'kind' in ((window as { __clearpitchMap?: object }).__clearpitchMap ?? {}),
			null,
			{
				timeout: 30_000
			}
		);
		await page.waitForLoadState('networkidle');
		await page.screenshot({ path: `${out}/editor-${width}.png` });
		await page.screenshot({ path: `${out}/editor-${width}-full.png`, fullPage: true });
		await page.goto(`${server.url}/estimates`);
		await page.screenshot({ path: `${out}/estimates-${width}.png`, fullPage: true });
		await ctx.close();
	}
} finally {
	await server.stop();
}
console.log(`Screenshots in ${out}/`);
