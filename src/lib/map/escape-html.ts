/** Map libraries put attribution in as HTML; the owner's text is text. */
export function escapeHtml(s: string): string {
	return s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}
