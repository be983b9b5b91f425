import type { z } from 'zod';

/**
 * PostgreSQL text cannot hold U+0000, so a NUL in stored free text fails the write; refuse it
 * at the edge with a field message instead.
 */
export const noNul = (text: string): boolean => !text.includes('\u0000');
export const NUL_MESSAGE = 'Remove the control character (NUL) from this text.';

export type FieldErrors = Record<string, string>;

/** Flattens zod issues to `{ "field.path": "first message" }` for forms and JSON bodies. */
export function fieldErrors(error: z.ZodError): FieldErrors {
	const out: FieldErrors = {};
	for (const issue of error.issues) {
		const key = issue.path.map(String).join('.') || '_';
		out[key] ??= issue.message;
	}
	return out;
}

export function formObject(data: FormData): Record<string, string> {
	const out: Record<string, string> = {};
	for (const [k, v] of data) if (typeof v === 'string') out[k] = v;
	return out;
}
