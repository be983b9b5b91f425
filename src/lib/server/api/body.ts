import { ApiError } from './errors';

/** Largest JSON body the API reads; a 30-facet roof plan is about 20 KB. */
export const MAX_JSON_BYTES = 256 * 1024;

const JSON_TYPE = /^application\/(?:[\w.+-]+\+)?json\s*(?:;|$)/i;

/**
 * Reads a JSON body. The size cap is counted on the stream itself, because Content-Length can
 * be missing (chunked) or wrong. 415 for another content type, 413 past the cap, 400 for
 * anything that is not JSON.
 */
export async function readJson(request: Request, limit = MAX_JSON_BYTES): Promise<unknown> {
	const type = request.headers.get('content-type') ?? '';
	if (!JSON_TYPE.test(type)) {
		throw new ApiError(
			415,
			`Send the body as JSON with "Content-Type: application/json"${type ? ` (got "${type}")` : ''}.`
		);
	}
	const text = await readCapped(request, limit);
	if (text.trim() === '') {
		throw new ApiError(400, 'The request body is empty; send a JSON object.', [
			{ path: '', message: 'body is empty' }
		]);
	}
	try {
		return JSON.parse(text);
	} catch (e) {
		const why = e instanceof SyntaxError ? e.message : 'not JSON';
		throw new ApiError(400, `The request body is not valid JSON: ${why}`, [
			{ path: '', message: `invalid JSON: ${why}` }
		]);
	}
}

async function readCapped(request: Request, limit: number): Promise<string> {
	const tooLarge = () =>
		new ApiError(413, `The request body is larger than ${Math.round(limit / 1024)} KB.`);
	const declared = Number(request.headers.get('content-length'));
	if (Number.isFinite(declared) && declared > limit) {
		await request.body?.cancel().catch(() => {});
		throw tooLarge();
	}
	if (!request.body) return '';
	const reader = request.body.getReader();
	const chunks: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		size += value.byteLength;
		if (size > limit) {
			await reader.cancel().catch(() => {});
			throw tooLarge();
		}
		chunks.push(value);
	}
	return new TextDecoder('utf-8', { fatal: false }).decode(concat(chunks, size));
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
