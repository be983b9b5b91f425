import { ApiError } from './errors';
import { parseJsonBody } from './refusal';

/** Largest JSON body the API reads; a 30-facet roof plan is about 20 KB. */
export const MAX_JSON_BYTES = 256 * 1024;

const JSON_TYPE = /^application\/(?:[\w.+-]+\+)?json\s*(?:;|$)/i;

/**
 * Reads a JSON body. The size cap is counted on the stream itself, because Content-Length can
 * be missing (chunked) or wrong. 415 for another content type, 413 past the cap, 400 for
 * anything that is not JSON.
 */
export async function readJson(request: Request, limit = MAX_JSON_BYTES): Promise<unknown> {
	const parsed = parseJsonBody(await readJsonBytes(request, limit));
	if (!parsed.ok) throw ApiError.from(parsed.refusal);
	return parsed.value;
}

/**
 * The body's bytes, after readJson's 415 and 413 checks, for a caller that decodes and parses
 * elsewhere (pricing does it on a worker thread).
 */
export async function readJsonBytes(request: Request, limit = MAX_JSON_BYTES): Promise<Uint8Array> {
	const type = request.headers.get('content-type') ?? '';
	if (!JSON_TYPE.test(type)) {
		throw new ApiError(
			415,
			`Send the body as JSON with "Content-Type: application/json"${type ? ` (got "${type}")` : ''}.`
		);
	}
	return readCapped(request, limit);
}

async function readCapped(request: Request, limit: number): Promise<Uint8Array> {
	if (!request.body) return new Uint8Array(0);
	const reader = request.body.getReader();
	const chunks: Uint8Array[] = [];
	let size = 0;
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) break;
			size += value.byteLength;
			// Past the cap nothing more is kept, but the rest is drained (adapter-node's
			// BODY_SIZE_LIMIT bounds it) so the client gets its 413 instead of a reset connection.
			if (size <= limit) chunks.push(value);
		}
	} catch (e) {
		if (size <= limit) throw e;
	}
	if (size > limit) {
		throw new ApiError(413, `The request body is larger than ${Math.round(limit / 1024)} KB.`);
	}
	return concat(chunks, size);
}

function concat(chunks: Uint8Array[], size: number): Uint8Array {
	if (chunks.length === 1) return chunks[0];
	const out = new Uint8Array(size);
	let at = 0;
	for (const c of chunks) {
		out.set(c, at);
		at += c.byteLength;
	}
	return out;
}
