// Photo fixtures made with sharp and by hand, for the upload tests. Positions are in the invented
// Wrenfield scene (geodata/scene.geojson).
import zlib from 'node:zlib';
import sharp from 'sharp';

/**
 * GPS as EXIF writes it: degrees, minutes, seconds as three rationals each, with N/S and E/W refs
 * (CIPA DC-008 Exif 2.32, GPS IFD tags 0x0001–0x0004). 35°31'11.22" N, 74°27'40.68" W is
 * 35 + 31/60 + 11.22/3600 = 35.519783…, −(74 + 27/60 + 40.68/3600) = −74.461300….
 */
export const FIXTURE_GPS = {
	lat: 35 + 31 / 60 + 11.22 / 3600,
	lon: -(74 + 27 / 60 + 40.68 / 3600),
	tags: {
		GPSLatitudeRef: 'N',
		GPSLatitude: '35/1 31/1 1122/100',
		GPSLongitudeRef: 'W',
		GPSLongitude: '74/1 27/1 4068/100'
	}
};

/** GPS tags for a position, seconds to 1/100 (the same encoding as FIXTURE_GPS). */
export function gpsTags(lat: number, lon: number): Record<string, string> {
	const dms = (v: number) => {
		const a = Math.abs(v);
		const d = Math.floor(a);
		const m = Math.floor((a - d) * 60);
		const cs = Math.round(((a - d) * 60 - m) * 60 * 100);
		return `${d}/1 ${m}/1 ${cs}/100`;
	};
	return {
		GPSLatitudeRef: lat >= 0 ? 'N' : 'S',
		GPSLatitude: dms(lat),
		GPSLongitudeRef: lon >= 0 ? 'E' : 'W',
		GPSLongitude: dms(lon)
	};
}

/** A small JPEG carrying GPS (FIXTURE_GPS unless given) and a capture time in its EXIF. */
export async function jpegWithGps(
	width = 640,
	height = 480,
	colour = '#6b7d5a',
	at?: { lat: number; lon: number }
): Promise<Buffer> {
	return sharp({ create: { width, height, channels: 3, background: colour } })
		.jpeg({ quality: 80 })
		.withExif({
			IFD0: { Make: 'Clearpitch fixture' },
			IFD2: { DateTimeOriginal: '2026:05:14 10:21:07', OffsetTimeOriginal: '-04:00' },
			IFD3: at ? gpsTags(at.lat, at.lon) : FIXTURE_GPS.tags
		})
		.toBuffer();
}

/**
 * A real PNG by the W3C PNG specification (3rd ed., §5.2 signature, §11.2.1 IHDR, §5.3 CRC-32
 * over type + data, zlib-compressed scanlines each led by a filter byte) whose header says
 * side × side pixels in 1-bit grey: small on disk, huge once decoded.
 */
export function pixelBombPng(side = 20_000): Buffer {
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
