import { json } from '@sveltejs/kit';
import { PhotoRefusal, type PhotoRefusalReason } from '../photos';

/** The one place a photo refusal becomes an HTTP status (DEVELOPERS.md, "Photos"). */
export function photoRefusalStatus(reason: PhotoRefusalReason): number {
	switch (reason) {
		case 'too-large':
			return 413;
		case 'not-an-image':
		case 'type-not-allowed':
			return 415;
		case 'too-many-photos':
			return 409;
		default:
			return 422;
	}
}

export function photoRefusalResponse(e: PhotoRefusal): Response {
	return json(
		{ message: e.message, file: e.file, reason: e.reason },
		{ status: photoRefusalStatus(e.reason) }
	);
}

const mb = (n: number) => `${(n / (1024 * 1024)).toFixed(1).replace(/\.0$/, '')} MB`;

function tooLarge(name: string, size: number | null, maxBytes: number): PhotoRefusal {
	return new PhotoRefusal(
		name,
		'too-large',
		`the file is ${size === null ? 'larger than that' : mb(size)}; photos may be at most ${mb(maxBytes)} each.`
	);
}

/**
 * An upload's bytes, refused as too large (naming the file) once past `maxBytes`. Past the cap
 * nothing more is kept but the rest is drained, so the client reads its 413 instead of a reset
 * connection; past adapter-node's BODY_SIZE_LIMIT the adapter ends the stream, which is the
 * same refusal.
 */
export async function readPhotoBody(
	request: Request,
	name: string,
	maxBytes: number
): Promise<Uint8Array> {
	const declared = Number(request.headers.get('content-length'));
	const known = Number.isFinite(declared) && declared > 0 ? declared : null;
	if (!request.body) return new Uint8Array(0);
	const reader = request.body.getReader();
	const chunks: Uint8Array[] = [];
	let size = 0;
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) break;
			size += value.byteLength;
			if (size <= maxBytes) chunks.push(value);
		}
	} catch (e) {
		if (size > maxBytes || (known !== null && known > maxBytes)) {
			throw tooLarge(name, known, maxBytes);
		}
		throw e;
	}
	if (size > maxBytes) throw tooLarge(name, size, maxBytes);
	const out = new Uint8Array(size);
	let at = 0;
	for (const c of chunks) {
		out.set(c, at);
		at += c.byteLength;
	}
	return out;
}
