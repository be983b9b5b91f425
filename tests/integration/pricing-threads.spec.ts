// POST /api/estimates prices on worker threads in the built server. Whatever it is sent, the
// threaded server must answer byte for byte what the same server answers pricing in place,
// also under concurrent requests, and a bad thread setting must stop it at start.
import { spawnSync } from 'node:child_process';
import { beforeAll, describe, expect, it } from 'vitest';
import { seededDataDir, startServer } from '../helpers/server';
import { prepareDataDir, sceneRequest, type Prepared } from './api-helpers';

let dataDir: string;
let prep: Prepared;

beforeAll(async () => {
	dataDir = seededDataDir('pricing-threads');
	prep = await prepareDataDir(dataDir);
});

const HOUSES = ['h01', 'h02', 'h03', 'h04', 'h05', 'h06', 'h07', 'h08', 'h09', 'h10'];

/** Bodies of each kind the endpoint sees, good and bad, none of them saved. */
function bodies(): Array<{ name: string; body: string }> {
	const h03 = sceneRequest('h03');
	const tile = sceneRequest('h04');
	return [
		...HOUSES.map((h) => ({ name: h, body: JSON.stringify(sceneRequest(h)) })),
		{
			name: 'test spot',
			body: JSON.stringify({
				...h03,
				testSpot: { strengthPct: 2, secondsToColourChange: 200, rinsedClean: false }
			})
		},
		{ name: 'empty', body: '' },
		{ name: 'not JSON', body: '{"facets": [' },
		{
			name: 'bad pitch',
			body: JSON.stringify({ facets: h03.facets!.map((f) => ({ ...f, pitch: 99 })) })
		},
		{
			name: 'roof on tile',
			body: JSON.stringify({
				facets: tile.facets!.map((f) => ({ ...f, material: 'clay_tile', access: 'roof' }))
			})
		},
		{
			name: 'unknown card',
			body: JSON.stringify({ ...h03, rateCardId: '0b7e6c1e-4a3f-4b8e-9d2c-3f1a2b3c4d5e' })
		},
		{ name: 'save without site', body: JSON.stringify({ ...h03, save: true }) }
	];
}

async function answers(threads: string) {
	const server = await startServer(dataDir, { CLEARPITCH_PRICING_THREADS: threads });
	try {
		const post = async (body: string) => {
			const r = await fetch(`${server.url}/api/estimates`, {
				method: 'POST',
				headers: { authorization: `Bearer ${prep.ownerToken}`, 'content-type': 'application/json' },
				body
			});
			return `${r.status} ${await r.text()}`;
		};
		const one = new Map<string, string>();
		for (const { name, body } of bodies()) one.set(name, await post(body));
		// 60 at once, shuffled: every answer must be its own body's, whichever thread priced it.
		const all = bodies();
		const burst = Array.from({ length: 60 }, (_, i) => all[(i * 7) % all.length]);
		const together = await Promise.all(
			burst.map(async ({ name, body }) => [name, await post(body)])
		);
		return { one, together, log: server.log() };
	} finally {
		await server.stop();
	}
}

describe('pricing threads', () => {
	it('answers exactly what pricing in place answers, one at a time and 60 at once', async () => {
		const threaded = await answers('2');
		const inPlace = await answers('0');
		expect(threaded.log).not.toMatch(/Pricing threads could not start|pricing thread failed/i);
		expect([...threaded.one.keys()]).toEqual(bodies().map((b) => b.name));
		for (const [name, answer] of inPlace.one) expect(threaded.one.get(name), name).toBe(answer);
		for (const [name, answer] of threaded.together)
			expect(answer, name).toBe(inPlace.one.get(name));
		// the bodies really are of both kinds
		expect(threaded.one.get('h03')).toMatch(/^200 /);
		expect(threaded.one.get('empty')).toMatch(/^400 .*body is empty/);
		expect(threaded.one.get('not JSON')).toMatch(/^400 .*not valid JSON/);
		expect(threaded.one.get('roof on tile')).toMatch(/^400 .*roof plan/);
		expect(threaded.one.get('unknown card')).toMatch(
			/^400 .*rateCardId is not one of your rate cards/
		);
	}, 120_000);

	it('refuses to start with a thread count that is not a whole number', () => {
		const r = spawnSync(process.execPath, ['scripts/start.js'], {
			env: {
				...process.env,
				PORT: '0',
				CLEARPITCH_DATA_DIR: dataDir,
				DATABASE_URL: '',
				CLEARPITCH_PRICING_THREADS: 'many'
			},
			encoding: 'utf8',
			timeout: 60_000
		});
		expect(r.status).toBe(78); // EX_CONFIG (sysexits.h)
		expect(r.stdout + r.stderr).toMatch(
			/Clearpitch cannot start: CLEARPITCH_PRICING_THREADS must be a whole number/
		);
	}, 70_000);
});
