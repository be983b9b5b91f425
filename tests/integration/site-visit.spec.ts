// The site visit against the built server on a fresh seeded PGlite: starting it, correcting facets
// (with field errors for bad input), every photo refusal (size, magic bytes, pixel limit, count)
// with nothing half-stored, photos kept to their company and served without EXIF, and confirming,
// which re-prices with the rate card's confirmed range and leaves the estimate ready.
import fs from 'node:fs';
import path from 'node:path';
import * as devalue from 'devalue';
import exifr from 'exifr';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { planFacetsOf } from '../../geodata/scene';
import { hashPassword } from '../../src/lib/server/auth/password';
import { users } from '../../src/lib/server/db/schema';
import type { RateCard } from '../../src/lib/estimating/rate-card';
import type { EstimateDetail } from '../../src/lib/types/estimate';
import type { PhotoDto, VisitDto } from '../../src/lib/types/site-visit';
import { createWithToken, signIn } from '../helpers/http';
import { addOtherCompany } from '../helpers/other-company';
import { FIXTURE_GPS, jpegWithGps, pixelBombPng } from '../helpers/photo-fixtures';
import { DEMO, seededDataDir, startServer, type TestServer } from '../helpers/server';
import { prepareDataDir, type Prepared } from './api-helpers';

const MAX_MB = 1;
const PER_VISIT = 4;
const OTHER_EMAIL = 'owner@marrowgate.example';
const OTHER_PASSWORD = 'marrowgate-test-2026';

let server: TestServer;
let dir: string;
let prep: Prepared;
const cookie = {} as Record<'owner' | 'sales' | 'crew' | 'other', string>;
/** h03: four asphalt facets, one of them ladder-only. h04: clay tile. */
const est = { h03: '', h04: '', h04site: '', h03site: '' };

async function session(email: string, password?: string): Promise<string> {
	const r = await signIn(server.url, email, password);
	if (!r.cookie) throw new Error(`sign-in as ${email}: ${r.status}`);
	return r.cookie;
}

/** Posts a form action the way `use:enhance` does, and decodes kit's answer. */
async function action(
	estimateId: string,
	name: string,
	fields: [string, string][] = [],
	who = cookie.sales
): Promise<{ status: number; type: string; data: Record<string, unknown> }> {
	const res = await fetch(`${server.url}/estimates/${estimateId}/visit?/${name}`, {
		method: 'POST',
		headers: {
			cookie: who,
			origin: server.url,
			accept: 'application/json',
			'x-sveltekit-action': 'true',
			'content-type': 'application/x-www-form-urlencoded'
		},
		body: new URLSearchParams(fields).toString()
	});
	const body = (await res.json()) as { type: string; status?: number; data?: string };
	return {
		status: body.status ?? res.status,
		type: body.type,
		data: body.data ? (devalue.parse(body.data) as Record<string, unknown>) : {}
	};
}

/** The visit page's data, as the browser would load it. */
async function pageData(estimateId: string, who = cookie.sales) {
	const res = await fetch(`${server.url}/estimates/${estimateId}/visit/__data.json`, {
		headers: { cookie: who }
	});
	expect(res.status).toBe(200);
	const body = (await res.json()) as { nodes: ({ data: unknown[] } | null)[] };
	const node = body.nodes.filter(Boolean).at(-1)!;
	return devalue.unflatten(node.data) as { visit: VisitDto | null; photos: PhotoDto[] };
}

async function upload(
	estimateId: string,
	name: string | null,
	bytes: Uint8Array,
	who = cookie.sales
): Promise<{ status: number; body: Record<string, unknown> }> {
	const headers: Record<string, string> = {
		cookie: who,
		origin: server.url,
		'content-type': 'application/octet-stream'
	};
	if (name !== null) headers['x-photo-name'] = encodeURIComponent(name);
	const res = await fetch(`${server.url}/api/estimates/${estimateId}/photos`, {
		method: 'POST',
		headers,
		body: bytes as Uint8Array<ArrayBuffer>
	});
	return { status: res.status, body: (await res.json()) as Record<string, unknown> };
}

async function estimateOf(id: string): Promise<EstimateDetail> {
	const res = await fetch(`${server.url}/api/estimates/${id}`, {
		headers: { authorization: `Bearer ${prep.ownerToken}` }
	});
	expect(res.status).toBe(200);
	return (await res.json()) as EstimateDetail;
}

/** Every stored file (both renditions of every photo), counted on disk without the disk store's
 * ".type" side files. */
function storedFiles(): number {
	const root = path.join(dir, 'files');
	if (!fs.existsSync(root)) return 0;
	return (fs.readdirSync(root, { recursive: true }) as string[]).filter(
		(p) => !p.endsWith('.type') && fs.statSync(path.join(root, p)).isFile()
	).length;
}

beforeAll(async () => {
	dir = seededDataDir('site-visit');
	prep = await prepareDataDir(dir);
	// A second tenant with a member of its own, who must never reach this company's photos.
	const hash = await hashPassword(OTHER_PASSWORD);
	await addOtherCompany(dir, async (db, other) => {
		await db.insert(users).values({
			companyId: other.companyId,
			email: OTHER_EMAIL,
			name: 'Perpetua Lowell',
			role: 'owner',
			passwordHash: hash
		});
	});
	server = await startServer(dir, {
		CLEARPITCH_PHOTO_MAX_MB: String(MAX_MB),
		CLEARPITCH_PHOTOS_PER_VISIT: String(PER_VISIT)
	});
	cookie.owner = await session(DEMO.owner);
	cookie.sales = await session(DEMO.sales);
	cookie.crew = await session(DEMO.crew);
	cookie.other = await session(OTHER_EMAIL, OTHER_PASSWORD);
	type Created = { plan: { id: string }; estimate: { id: string } };
	for (const house of ['h03', 'h04'] as const) {
		const site = prep.sites.find((s) => s.houseId === house)!;
		const plan = (
			await createWithToken<Created>(server.url, prep.ownerToken, '/api/roof-plans', {
				siteId: site.id,
				facets: planFacetsOf(house),
				baseVersion: null
			})
		).plan;
		est[house] = (
			await createWithToken<Created>(server.url, prep.ownerToken, '/api/estimates', {
				roofPlanId: plan.id,
				siteId: site.id,
				save: true
			})
		).estimate.id;
		est[`${house}site`] = site.id;
	}
});
afterAll(async () => server?.stop());

describe('starting a site visit', () => {
	it('refuses photos before the visit starts, and another company’s estimate is a 404', async () => {
		const jpeg = await jpegWithGps();
		expect((await upload(est.h03, 'early.jpg', jpeg)).status).toBe(409);
		expect((await upload(est.h03, 'early.jpg', jpeg, cookie.other)).status).toBe(404);
		expect(storedFiles()).toBe(0);
	});

	it('starts once, from the estimate’s roof plan, and a second start answers the same visit', async () => {
		const a = await action(est.h03, 'start');
		expect([a.status, a.type]).toEqual([200, 'success']);
		const first = (await pageData(est.h03)).visit!;
		expect(first.basePlanVersion).toBe(1);
		expect(first.facets.map((f) => f.id)).toEqual(planFacetsOf('h03').map((f) => f.id));
		expect(first.facets.every((f) => !f.checked)).toBe(true);
		const b = await action(est.h03, 'start', [], cookie.owner);
		expect(b.status).toBe(200);
		expect((await pageData(est.h03)).visit!.id).toBe(first.id);
	});

	it('does not let the crew or another company open the visit', async () => {
		const crew = await fetch(`${server.url}/estimates/${est.h03}/visit`, {
			headers: { cookie: cookie.crew },
			redirect: 'manual'
		});
		expect(crew.status).toBe(403);
		const other = await fetch(`${server.url}/estimates/${est.h03}/visit`, {
			headers: { cookie: cookie.other }
		});
		expect(other.status).toBe(404);
	});
});

describe('facet corrections and site notes', () => {
	it('answers bad input with field errors and changes nothing', async () => {
		const before = (await pageData(est.h03)).visit!;
		const f = before.facets[0];
		const good: Record<string, string> = {
			facetId: f.id,
			pitch: '9',
			material: f.material,
			growth: 'G2',
			access: 'ladder',
			stories: String(f.stories)
		};
		const bad: [Record<string, string>, string][] = [
			[{ pitch: 'steep' }, 'pitch'],
			[{ pitch: '25' }, 'pitch'],
			[{ pitch: '0x1F' }, 'pitch'],
			[{ growth: 'G9' }, 'growth'],
			[{ access: 'crane' }, 'access'],
			[{ stories: '4' }, 'stories'],
			[{ facetId: '../x' }, 'facetId']
		];
		for (const [change, field] of bad) {
			const r = await action(est.h03, 'facet', Object.entries({ ...good, ...change }));
			expect(r.status, JSON.stringify(change)).toBe(400);
			expect((r.data.errors as Record<string, string>)[field], field).toBeTruthy();
		}
		// A facet id that is well-formed but not on the plan: a field error from the service.
		const unknown = await action(est.h03, 'facet', Object.entries({ ...good, facetId: 'nope' }));
		expect(unknown.status).toBe(400);
		expect((unknown.data.errors as Record<string, string>).facetId).toMatch(
			/not on this roof plan/
		);
		const site = await action(est.h03, 'site', [
			['obstacles', 'fence'],
			['obstacles', 'moat']
		]);
		expect(site.status).toBe(400);
		expect(await pageData(est.h03)).toMatchObject({ visit: before });
	});

	it('refuses roof access on clay tile, as the model does (common practice: tile is not walked)', async () => {
		await action(est.h04, 'start');
		const v = (await pageData(est.h04)).visit!;
		const f = v.facets[0];
		expect(f.material).toBe('clay_tile');
		const r = await action(est.h04, 'facet', [
			['facetId', f.id],
			['pitch', String(f.pitch)],
			['material', 'clay_tile'],
			['growth', f.growth],
			['access', 'roof'],
			['stories', String(f.stories)]
		]);
		expect(r.status).toBe(400);
		expect((r.data.errors as Record<string, string>).access).toMatch(/roof access is refused/i);
		expect((await pageData(est.h04)).visit!.facets[0]).toEqual(f);
	});

	it('saves a correction, the obstacles and the test spot', async () => {
		const v = (await pageData(est.h03)).visit!;
		const f = v.facets[0];
		const r = await action(est.h03, 'facet', [
			['facetId', f.id],
			['pitch', '9'],
			['material', f.material],
			['growth', 'G2'],
			['access', 'ladder'],
			['stories', String(f.stories)]
		]);
		expect([r.status, r.type]).toEqual([200, 'success']);
		const site = await action(est.h03, 'site', [
			['obstacles', 'shrubs_beds'],
			['obstacles', 'power_line'],
			['waterSource', 'Spigot by the garage'],
			['pets', 'Two cats, kept in'],
			['gateNotes', 'Side gate, latch sticks']
		]);
		expect(site.status).toBe(200);
		const spot = await action(est.h03, 'testSpot', [
			['strengthPct', '3'],
			['secondsToColourChange', '200'],
			['rinsedClean', 'no'],
			['facetIds', f.id]
		]);
		expect(spot.status).toBe(200);
		const after = (await pageData(est.h03)).visit!;
		expect(after.facets[0]).toMatchObject({
			pitch: 9,
			growth: 'G2',
			access: 'ladder',
			checked: true,
			remote: { pitch: f.remote.pitch, growth: f.remote.growth, access: f.remote.access }
		});
		expect(after.facets.slice(1)).toEqual(v.facets.slice(1));
		expect(after.obstacles.sort()).toEqual(['power_line', 'shrubs_beds']);
		expect(after.testSpot).toEqual({
			strengthPct: 3,
			secondsToColourChange: 200,
			rinsedClean: false,
			facetIds: [f.id]
		});
	});
});

describe('photo uploads', () => {
	let kept: PhotoDto;

	it('stores a photo with its EXIF position and serves copies that carry no EXIF', async () => {
		const original = await jpegWithGps();
		// The fixture really has GPS (read back by exifr, a reference reader).
		expect((await exifr.gps(original)).latitude).toBeCloseTo(FIXTURE_GPS.lat, 5);
		const r = await upload(est.h03, 'north slope.jpg', original);
		expect(r.status).toBe(201);
		kept = r.body.photo as PhotoDto;
		expect(kept.fileName).toBe('north slope.jpg');
		expect(kept.lat).toBeCloseTo(FIXTURE_GPS.lat, 6);
		expect(kept.lon).toBeCloseTo(FIXTURE_GPS.lon, 6);
		expect(kept.takenAt).toBe('2026-05-14T10:21:07');
		expect(kept.forProposal).toBe(false);
		expect(storedFiles()).toBe(2);
		for (const rendition of ['thumb', 'display']) {
			const res = await fetch(`${server.url}/photos/${kept.id}/${rendition}`, {
				headers: { cookie: cookie.crew }
			});
			expect(res.status).toBe(200);
			expect(res.headers.get('content-type')).toBe('image/jpeg');
			const bytes = Buffer.from(await res.arrayBuffer());
			// JPEG SOI FF D8 FF (ISO/IEC 10918-1) and no APP1 "Exif\0\0" segment.
			expect([...bytes.subarray(0, 3)]).toEqual([0xff, 0xd8, 0xff]);
			expect(bytes.includes(Buffer.from('Exif\0\0', 'latin1'))).toBe(false);
			expect(await exifr.parse(bytes)).toBeUndefined();
			const meta = await sharp(bytes).metadata();
			expect(Math.max(meta.width!, meta.height!)).toBe(rendition === 'thumb' ? 320 : 640);
		}
	});

	it('keeps photos to their company: another company gets 404, a stranger is sent to sign in', async () => {
		for (const path of [`/photos/${kept.id}/thumb`, `/photos/${kept.id}/display`]) {
			const other = await fetch(server.url + path, { headers: { cookie: cookie.other } });
			expect(other.status).toBe(404);
			expect(other.headers.get('content-type')).not.toBe('image/jpeg');
			const stranger = await fetch(server.url + path, { redirect: 'manual' });
			expect(stranger.status).toBe(303);
			expect(stranger.headers.get('location')).toMatch(/^\/sign-in\?next=/);
		}
		const list = await fetch(`${server.url}/api/estimates/${est.h03}/photos`, {
			headers: { cookie: cookie.other }
		});
		expect(list.status).toBe(404);
		const toggle = await action(
			est.h03,
			'photo',
			[
				['photoId', kept.id],
				['forProposal', 'true']
			],
			cookie.other
		);
		expect(toggle.status).toBe(404);
		const gone = await action(est.h03, 'deletePhoto', [['photoId', kept.id]], cookie.other);
		expect(gone.status).toBe(404);
		expect((await pageData(est.h03)).photos).toEqual([kept]);
		expect(
			(
				await fetch(`${server.url}/photos/${kept.id}/original`, {
					headers: { cookie: cookie.sales }
				})
			).status
		).toBe(404);
	});

	it('refuses each bad file with a 4xx naming it, and stores nothing of it', async () => {
		const jpeg = await jpegWithGps();
		// Over the cap: a real JPEG padded past 1 MB (bytes after EOI are ignored by decoders).
		const big = Buffer.concat([jpeg, Buffer.alloc(MAX_MB * 1024 * 1024, 0x20)]);
		// Past adapter-node's BODY_SIZE_LIMIT too (cap + 1 MB, scripts/start.js).
		const huge = Buffer.concat([jpeg, Buffer.alloc((MAX_MB + 2) * 1024 * 1024, 0x20)]);
		const html = Buffer.from('<!doctype html><title>roof</title><p>not a photo</p>');
		// %PDF- is the PDF header (ISO 32000-1 §7.5.2): a real type, not one a photo may be.
		const pdf = Buffer.from('%PDF-1.7\n1 0 obj\n<< /Type /Catalog >>\nendobj\n%%EOF\n');
		const cases: [string, Uint8Array, number, string][] = [
			['big-ridge.jpg', big, 413, 'too-large'],
			['huge-ridge.jpg', huge, 413, 'too-large'],
			['roof.jpg', html, 415, 'not-an-image'],
			['estimate.jpeg', pdf, 415, 'type-not-allowed'],
			['bomb.png', pixelBombPng(), 422, 'too-many-pixels'],
			['empty.jpg', new Uint8Array(0), 422, 'empty']
		];
		for (const [name, bytes, status, reason] of cases) {
			const files = storedFiles();
			const r = await upload(est.h03, name, bytes);
			expect(r.status, name).toBe(status);
			expect(r.body.reason, name).toBe(reason);
			expect(r.body.file, name).toBe(name);
			expect(String(r.body.message), name).toContain(name);
			expect(storedFiles(), name).toBe(files);
		}
		expect((await pageData(est.h03)).photos).toEqual([kept]);
	});

	it('answers a request without a file name with a 400', async () => {
		const r = await upload(est.h03, null, await jpegWithGps());
		expect(r.status).toBe(400);
		expect(String(r.body.message)).toMatch(/upload/);
		const bad = await fetch(`${server.url}/api/estimates/${est.h03}/photos`, {
			method: 'POST',
			headers: {
				cookie: cookie.sales,
				origin: server.url,
				'content-type': 'application/octet-stream',
				'x-photo-name': '%E0%A4%A'
			},
			body: (await jpegWithGps()) as Uint8Array<ArrayBuffer>
		});
		expect(bad.status).toBe(400);
	});

	it('refuses the photo past the per-visit limit by name, with nothing half-stored', async () => {
		for (let i = 2; i <= PER_VISIT; i++) {
			expect((await upload(est.h03, `side-${i}.jpg`, await jpegWithGps(200, 150))).status).toBe(
				201
			);
		}
		const files = storedFiles();
		expect(files).toBe(PER_VISIT * 2);
		const r = await upload(est.h03, 'one-too-many.jpg', await jpegWithGps(200, 150));
		expect(r.status).toBe(409);
		expect(r.body.reason).toBe('too-many-photos');
		expect(String(r.body.message)).toContain('one-too-many.jpg');
		expect(storedFiles()).toBe(files);
		expect((await pageData(est.h03)).photos).toHaveLength(PER_VISIT);
	});

	it('marks a photo for the proposal and deletes one with both its files', async () => {
		const on = await action(est.h03, 'photo', [
			['photoId', kept.id],
			['forProposal', 'true']
		]);
		expect(on.status).toBe(200);
		const photos = (await pageData(est.h03)).photos;
		expect(photos.find((p) => p.id === kept.id)!.forProposal).toBe(true);
		expect(photos.filter((p) => p.forProposal)).toHaveLength(1);
		const last = photos.at(-1)!;
		const files = storedFiles();
		const del = await action(est.h03, 'deletePhoto', [['photoId', last.id]]);
		expect(del.status).toBe(200);
		expect(storedFiles()).toBe(files - 2);
		expect((await pageData(est.h03)).photos.map((p) => p.id)).not.toContain(last.id);
		const res = await fetch(`${server.url}/photos/${last.id}/thumb`, {
			headers: { cookie: cookie.sales }
		});
		expect(res.status).toBe(404);
	});
});

describe('confirming the visit', () => {
	it('re-prices with the confirmed range, saves the site-visit plan copy and leaves the estimate ready', async () => {
		const cards = (await (
			await fetch(`${server.url}/api/rate-cards`, {
				headers: { authorization: `Bearer ${prep.ownerToken}` }
			})
		).json()) as { items: { id: string; card: RateCard }[] };
		const before = await estimateOf(est.h03);
		const card = cards.items.find((c) => c.id === before.rateCard.id)!.card;
		expect(before.status).toBe('draft');
		expect(before.result.price.measuredOnSite).toBe(false);
		const pct = (cents: number, p: number) => (cents * p) / 100;
		// The remote range: −lowPct / +highPct of the total (rate card range.remote; PRODUCT.md
		// "remote-only range −10%/+15%", demo defaults). Within a cent for the model's rounding.
		const t0 = before.result.price.totalCents;
		expect(before.result.price.lowCents).toBeCloseTo(t0 - pct(t0, card.range.remote.lowPct), -0.5);
		expect(before.result.price.highCents).toBeCloseTo(
			t0 + pct(t0, card.range.remote.highPct),
			-0.5
		);
		const visit = (await pageData(est.h03)).visit!;

		const r = await action(est.h03, 'confirm');
		expect([r.status, r.type]).toEqual([200, 'success']);
		const after = await estimateOf(est.h03);
		expect(after.status).toBe('ready');
		expect(after.rateCard).toEqual(before.rateCard);
		const p = after.result.price;
		expect(p.measuredOnSite).toBe(true);
		const t1 = p.totalCents;
		expect(after.totalCents).toBe(t1);
		// The confirmed range from the same card (range.confirmed, 3% / 5% by default).
		expect(card.range.confirmed.lowPct).toBeLessThan(card.range.remote.lowPct);
		expect(p.lowCents).toBeCloseTo(t1 - pct(t1, card.range.confirmed.lowPct), -0.5);
		expect(p.highCents).toBeCloseTo(t1 + pct(t1, card.range.confirmed.highPct), -0.5);
		expect((p.highCents - p.lowCents) / t1).toBeLessThan(
			(before.result.price.highCents - before.result.price.lowCents) / t0
		);

		// The visit's findings are what was priced: the corrected facet, flags and test spot.
		const f0 = after.input.facets[0];
		expect([f0.pitch, f0.growth, f0.access]).toEqual([9, 'G2', 'ladder']);
		expect(after.result.facets[0].pitch).toBe(9);
		expect(after.input.siteFlags).toMatchObject({ plantsToProtect: true, noGutters: false });
		expect(after.input.testSpot).toEqual({
			strengthPct: 3,
			secondsToColourChange: 200,
			rinsedClean: false,
			facetIds: [visit.facets[0].id]
		});
		// 200 s and not rinsed clean is a slow spot: one step up from the G2 suggestion (rate card
		// testSpot.adjustStepPct; docs/estimating-model.md §4, common practice).
		expect(after.result.facets[0].mixStrengthPct).toBeGreaterThan(
			after.result.facets[0].suggestedStrengthPct
		);
		expect(after.result.expectations.map((n) => n.code)).toContain('test_spot.slow');

		const plans = (await (
			await fetch(`${server.url}/api/sites/${est.h03site}/roof-plans`, {
				headers: { authorization: `Bearer ${prep.ownerToken}` }
			})
		).json()) as { versions: { id: string; version: number; source: string }[] };
		const copy = plans.versions.find((x) => x.version === 2)!;
		expect(copy.source).toBe('site_visit');
		expect(after.roofPlanId).toBe(copy.id);
		const confirmed = (await pageData(est.h03)).visit!;
		expect(confirmed.confirmedAt).not.toBeNull();
		expect(confirmed.confirmedPlanVersion).toBe(2);
	});

	it('a second confirm changes nothing, and the confirmed visit takes no more corrections', async () => {
		const before = await estimateOf(est.h03);
		const visit = (await pageData(est.h03)).visit!;
		const again = await action(est.h03, 'confirm', [], cookie.owner);
		expect(again.status).toBe(200);
		expect(String(again.data.done)).toMatch(/already confirmed/);
		const f = visit.facets[1];
		const late = await action(est.h03, 'facet', [
			['facetId', f.id],
			['pitch', '12'],
			['material', f.material],
			['growth', f.growth],
			['access', f.access],
			['stories', String(f.stories)]
		]);
		expect(late.status).toBe(409);
		expect(await estimateOf(est.h03)).toEqual(before);
		expect((await pageData(est.h03)).visit).toEqual(visit);
	});

	it('refuses to re-price an estimate that was sent, and writes nothing', async () => {
		const moved = await fetch(`${server.url}/api/estimates/${est.h04}`, {
			method: 'PATCH',
			headers: { authorization: `Bearer ${prep.ownerToken}`, 'content-type': 'application/json' },
			body: JSON.stringify({ status: 'ready' })
		});
		expect(moved.status).toBe(200);
		const sent = await fetch(`${server.url}/api/estimates/${est.h04}`, {
			method: 'PATCH',
			headers: { authorization: `Bearer ${prep.ownerToken}`, 'content-type': 'application/json' },
			body: JSON.stringify({ status: 'sent' })
		});
		expect(sent.status).toBe(200);
		const before = await estimateOf(est.h04);
		const r = await action(est.h04, 'confirm');
		expect(r.status).toBe(409);
		expect(await estimateOf(est.h04)).toEqual(before);
		const plans = (await (
			await fetch(`${server.url}/api/sites/${est.h04site}/roof-plans`, {
				headers: { authorization: `Bearer ${prep.ownerToken}` }
			})
		).json()) as { versions: unknown[] };
		expect(plans.versions).toHaveLength(1);
	});
});
