// Site-visit photos: the real type from the bytes, the size cap, the pixel limit, EXIF position
// and time read from the original, and copies with no EXIF at all.
// Fixtures are made here with sharp; the coordinates are the invented Wrenfield scene's
// (geodata/scene.geojson, house h01 at 35.519783687, -74.461300893).
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import exifr from 'exifr';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import {
	PhotoRefusal,
	checkRoomForPhotos,
	processPhoto,
	storePhoto,
	type ProcessedPhoto
} from '$lib/server/photos';
import { DiskStorage, type Storage } from '$lib/server/storage';

const LIMITS = { maxBytes: 15 * 1024 * 1024, maxPixels: 50_000_000 };
const root = path.resolve('tmp/photos', `run-${process.pid}-${Date.now()}`);
afterAll(() => fs.rmSync(root, { recursive: true, force: true }));

// 35°31'11.22" N, 74°27'40.68" W. Degrees = d + m/60 + s/3600 (CIPA DC-008 Exif 2.32, GPS
// IFD tags 0x0001–0x0004: GPSLatitudeRef/GPSLatitude/GPSLongitudeRef/GPSLongitude as three
// rationals each): 35 + 31/60 + 11.22/3600 = 35.519783…, 74 + 27/60 + 40.68/3600 = 74.461300…
const GPS = {
	GPSLatitudeRef: 'N',
	GPSLatitude: '35/1 31/1 1122/100',
	GPSLongitudeRef: 'W',
	GPSLongitude: '74/1 27/1 4068/100'
};

async function jpegWithExif(width = 1200, height = 900): Promise<Buffer> {
	return sharp({ create: { width, height, channels: 3, background: '#6b7d5a' } })
		.jpeg({ quality: 80 })
		.withExif({
			IFD0: { Make: 'Clearpitch fixture', Orientation: '1' },
			IFD2: { DateTimeOriginal: '2026:05:14 10:21:07', OffsetTimeOriginal: '-04:00' },
			IFD3: GPS
		})
		.toBuffer();
}

async function refusal(p: Promise<unknown>): Promise<PhotoRefusal> {
	const e = await p.then(
		() => null,
		(x) => x
	);
	expect(e).toBeInstanceOf(PhotoRefusal);
	return e as PhotoRefusal;
}

/**
 * A real PNG by the W3C PNG specification (3rd ed., §5.2 signature, §11.2.1 IHDR, §5.3 CRC-32
 * over type + data, zlib-compressed scanlines each led by a filter byte) whose header says
 * 20000 × 20000 (400 megapixels) in 1-bit grey: about 50 KB on disk, 400 M pixels decoded.
 */
function pixelBombPng(side = 20_000): Buffer {
	const chunk = (type: string, data: Buffer) => {
		const td = Buffer.concat([Buffer.from(type, 'ascii'), data]);
		const len = Buffer.alloc(4);
		len.writeUInt32BE(data.length);
		const crc = Buffer.alloc(4);
		crc.writeUInt32BE(zlib.crc32(td));
		return Buffer.concat([len, td, crc]);
	};
	const ihdr = Buffer.alloc(13);
	ihdr.writeUInt32BE(side, 0);
	ihdr.writeUInt32BE(side, 4);
	ihdr[8] = 1; // bit depth
	ihdr[9] = 0; // greyscale
	const row = 1 + Math.ceil(side / 8);
	const idat = zlib.deflateSync(Buffer.alloc(row * side), { level: 9 });
	return Buffer.concat([
		Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
		chunk('IHDR', ihdr),
		chunk('IDAT', idat),
		chunk('IEND', Buffer.alloc(0))
	]);
}

describe('processPhoto', () => {
	it('reads position and time from the original and strips every tag from both copies', async () => {
		const original = await jpegWithExif();
		// The fixture really carries GPS (read back by exifr, a reference reader).
		const before = await exifr.gps(original);
		expect(before.latitude).toBeCloseTo(35.519783, 5);

		const p = await processPhoto({ name: 'north-slope.jpg', bytes: original }, LIMITS);
		expect(p.type).toBe('image/jpeg');
		expect([p.width, p.height]).toEqual([1200, 900]);
		expect(p.position!.lat).toBeCloseTo(35 + 31 / 60 + 11.22 / 3600, 6);
		expect(p.position!.lon).toBeCloseTo(-(74 + 27 / 60 + 40.68 / 3600), 6);
		expect(p.takenAt).toBe('2026-05-14T10:21:07');
		expect(p.takenAtOffset).toBe('-04:00');

		for (const copy of [p.display, p.thumbnail]) {
			// JPEG SOI marker FF D8 FF (ISO/IEC 10918-1), and no APP1 "Exif\0\0" segment at all.
			expect([...copy.bytes.subarray(0, 3)]).toEqual([0xff, 0xd8, 0xff]);
			expect(copy.bytes.includes(Buffer.from('Exif\0\0', 'latin1'))).toBe(false);
			expect(await exifr.gps(copy.bytes)).toBeUndefined();
			expect(await exifr.parse(copy.bytes)).toBeUndefined();
		}
		expect(Math.max(p.thumbnail.width, p.thumbnail.height)).toBe(320);
		expect([p.display.width, p.display.height]).toEqual([1200, 900]);
	});

	it('shrinks a large photo to the display size and turns it upright', async () => {
		// Orientation 6 = "rotate 90° CW to view" (Exif 2.32 tag 0x0112): a 3000×2000 sensor
		// image is seen as 2000×3000, so the copies are portrait.
		const sideways = await sharp({
			create: { width: 3000, height: 2000, channels: 3, background: '#777' }
		})
			.jpeg()
			// sharp writes the orientation tag itself from withMetadata (withExif's is overridden).
			.withMetadata({ orientation: 6 })
			.toBuffer();
		expect((await sharp(sideways).metadata()).orientation).toBe(6);
		const p = await processPhoto({ name: 'ridge.jpg', bytes: sideways }, LIMITS);
		expect([p.width, p.height]).toEqual([2000, 3000]);
		expect([p.display.width, p.display.height]).toEqual([1365, 2048]);
		expect(p.display.height).toBeGreaterThan(p.display.width);
		expect(p.position).toBeNull();
		expect(p.takenAt).toBeNull();
	});

	it('takes PNG and WebP by their bytes, even under a misleading name', async () => {
		const png = await sharp({
			create: { width: 40, height: 30, channels: 4, background: { r: 0, g: 0, b: 0, alpha: 0 } }
		})
			.png()
			.toBuffer();
		const webp = await sharp({ create: { width: 40, height: 30, channels: 3, background: '#123' } })
			.webp()
			.toBuffer();
		const a = await processPhoto({ name: 'photo.jpg', bytes: png }, LIMITS);
		expect(a.type).toBe('image/png');
		// Transparent pixels become white, not black, in the JPEG copy.
		const { data } = await sharp(a.display.bytes).raw().toBuffer({ resolveWithObject: true });
		expect(data[0]).toBeGreaterThan(240);
		const b = await processPhoto({ name: 'IMG_0001.HEIC', bytes: webp }, LIMITS);
		expect(b.type).toBe('image/webp');
	});

	it('refuses wrong magic bytes whatever the name says', async () => {
		const html = Buffer.from('<!doctype html><html><body><script>alert(1)</script></body></html>');
		const r1 = await refusal(processPhoto({ name: 'roof.jpg', bytes: html }, LIMITS));
		expect(r1.reason).toBe('not-an-image');
		expect(r1.message).toMatch(/^roof\.jpg: /);

		// GIF89a (a real image, but not a photo type Clearpitch takes).
		const gif = await sharp({ create: { width: 4, height: 4, channels: 3, background: '#fff' } })
			.gif()
			.toBuffer();
		expect([...gif.subarray(0, 6)].map((c) => String.fromCharCode(c)).join('')).toBe('GIF89a');
		const r2 = await refusal(processPhoto({ name: 'gutter.png', bytes: gif }, LIMITS));
		expect(r2.reason).toBe('type-not-allowed');
		expect(r2.message).toContain('gutter.png');

		// PDF ("%PDF-", ISO 32000-1 §7.5.2) named as a photo.
		const pdf = Buffer.from('%PDF-1.7\n1 0 obj\n<<>>\nendobj\ntrailer\n<<>>\n%%EOF\n');
		const r3 = await refusal(processPhoto({ name: 'valley.webp', bytes: pdf }, LIMITS));
		expect(r3.reason).toBe('type-not-allowed');
	});

	it('refuses a file over the size cap and an empty one', async () => {
		const jpeg = await jpegWithExif(400, 300);
		const r = await refusal(
			processPhoto({ name: 'big.jpg', bytes: jpeg }, { ...LIMITS, maxBytes: 1000 })
		);
		expect(r.reason).toBe('too-large');
		expect(r.message).toContain('big.jpg');
		const e = await refusal(processPhoto({ name: 'none.jpg', bytes: new Uint8Array() }, LIMITS));
		expect(e.reason).toBe('empty');
	});

	it('refuses a decompression bomb from its header, before decoding', async () => {
		const bomb = pixelBombPng();
		expect(bomb.length).toBeLessThan(200_000);
		const meta = await sharp(bomb, { limitInputPixels: false }).metadata();
		expect([meta.width, meta.height]).toEqual([20_000, 20_000]);
		const r = await refusal(processPhoto({ name: 'bomb.png', bytes: bomb }, LIMITS));
		expect(r.reason).toBe('too-many-pixels');
		expect(r.message).toMatch(/^bomb\.png: .*20000 × 20000/);
		// sharp's own guard agrees when asked to decode it.
		await expect(sharp(bomb, { limitInputPixels: LIMITS.maxPixels }).toBuffer()).rejects.toThrow(
			/pixel limit/i
		);
	});

	it('refuses a photo cut short', async () => {
		const jpeg = await jpegWithExif(800, 600);
		const cut = jpeg.subarray(0, Math.floor(jpeg.length / 2));
		const r = await refusal(processPhoto({ name: 'cut.jpg', bytes: cut }, LIMITS));
		expect(r.reason).toBe('unreadable');
	});
});

describe('per-visit limit and storing', () => {
	it('refuses a batch that would pass the visit limit, naming the first file that does not fit', () => {
		expect(() => checkRoomForPhotos(38, ['a.jpg', 'b.jpg'], 40)).not.toThrow();
		try {
			checkRoomForPhotos(38, ['a.jpg', 'b.jpg', 'c.jpg'], 40);
			expect.unreachable();
		} catch (e) {
			expect(e).toBeInstanceOf(PhotoRefusal);
			expect((e as PhotoRefusal).reason).toBe('too-many-photos');
			expect((e as PhotoRefusal).file).toBe('c.jpg');
		}
	});

	it('stores both copies under server keys, or neither when the second write fails', async () => {
		const p = await processPhoto(
			{ name: '../../etc/passwd.jpg', bytes: await jpegWithExif(300, 200) },
			LIMITS
		);
		const disk = new DiskStorage(path.join(root, 'ok'));
		const stored = await storePhoto(disk, 'c0mpany', p);
		expect(stored.displayKey).toMatch(/^photos\/c0mpany\/[0-9a-f-]{36}$/);
		expect(stored.displayKey).not.toContain('passwd');
		expect(await disk.exists(stored.displayKey)).toBe(true);
		expect(await disk.exists(stored.thumbnailKey)).toBe(true);

		const inner = new DiskStorage(path.join(root, 'half'));
		let puts = 0;
		const failing: Storage = {
			kind: 'disk',
			put: async (k, b, t) => {
				if (++puts === 2) throw new Error('disk full');
				await inner.put(k, b, t);
			},
			get: (k) => inner.get(k),
			delete: (k) => inner.delete(k),
			exists: (k) => inner.exists(k)
		};
		await expect(storePhoto(failing, 'c0mpany', p as ProcessedPhoto)).rejects.toThrow('disk full');
		const left = fs.existsSync(path.join(root, 'half', 'photos', 'c0mpany'))
			? fs
					.readdirSync(path.join(root, 'half', 'photos', 'c0mpany'))
					.filter((f) => !f.endsWith('.type'))
			: [];
		expect(left).toEqual([]);
	});
});
