/**
 * JSON answer for the hot path. The body is encoded to UTF-8 once and handed over as bytes:
 * a string body would be encoded again by the Response, and kit's json() encodes it a third
 * time to measure it.
 */
export function jsonResponse(data: unknown, status = 200): Response {
	const body = Buffer.from(JSON.stringify(data), 'utf8');
	return new Response(body, {
		status,
		headers: {
			'content-type': 'application/json',
			'content-length': String(body.byteLength)
		}
	});
}
