const HTML_ESCAPES: Record<string, string> = {
	'&': '&amp;',
	'<': '&lt;',
	'>': '&gt;',
	'"': '&quot;',
	"'": '&#39;'
};

/** Escapes a value for HTML text and quoted attributes (OWASP XSS Prevention, rule 1 and 2). */
export function escapeHtml(value: unknown): string {
	return String(value ?? '').replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]);
}

/** A header value on one line: CR/LF would let a value add headers of its own. */
export function oneLine(value: string): string {
	return value.replace(/[\r\n]+/g, ' ').trim();
}
