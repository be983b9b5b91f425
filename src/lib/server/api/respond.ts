/**
 * JSON answers for the hot path. The body is encoded to UTF-8 once and handed over as bytes:
 * a string body would be encoded again by the Response, and kit's json() encodes it a third
 * time to measure it.
 */
export function jsonResponse(data: unknown, status = 200): Response {
	return jsonBytesResponse(JSON.stringify(data), status);
}

/** An answer already serialized: a string, or UTF-8 bytes (from a pricing thread, say). */
export function jsonBytesResponse(json: string | Uint8Array, status = 200): Response {
	const body = typeof json === 'string' ? Buffer.from(json, 'utf8') : json;
	return new Response(body as Uint8Array<ArrayBuffer>, {
		status,
		headers: {
			'content-type': 'application/json',
			'content-length': String(body.byteLength)
		}
	});
}
