/**
 * JSON answer for the hot path. Kit's json() measures the body by encoding it a second time;
 * Buffer.byteLength counts the same UTF-8 bytes without building them.
 */
export function jsonResponse(data: unknown, status = 200): Response {
	const body = JSON.stringify(data);
	return new Response(body, {
		status,
		headers: {
			'content-type': 'application/json',
			'content-length': String(Buffer.byteLength(body))
		}
	});
}
