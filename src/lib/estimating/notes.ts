import type { Note } from './types';

interface Entry {
	code: string;
	message: string;
	facetIds: string[] | undefined;
	path: string | undefined;
	/** For a note about one facet's field: built into a path only when the note is listed. */
	facetIndex: number;
	field: string | undefined;
	count: number;
}

/** Collects notes by code so one message lists every facet it applies to, in input order. */
export class NoteCollector {
	private readonly byCode = new Map<string, Entry>();

	add(code: string, message: string, facetId?: string, path?: string): void {
		this.put(code, message, facetId, path, -1, undefined);
	}

	/** A note about one field of facet facetIndex (path facets.N.field when it stays single). */
	addForField(
		code: string,
		message: string,
		facetId: string,
		facetIndex: number,
		field: string
	): void {
		this.put(code, message, facetId, undefined, facetIndex, field);
	}

	private put(
		code: string,
		message: string,
		facetId: string | undefined,
		path: string | undefined,
		facetIndex: number,
		field: string | undefined
	): void {
		const e = this.byCode.get(code);
		if (!e) {
			this.byCode.set(code, {
				code,
				message,
				facetIds: facetId === undefined ? undefined : [facetId],
				path,
				facetIndex,
				field,
				count: 1
			});
		} else {
			e.count++;
			if (facetId !== undefined) (e.facetIds ??= []).push(facetId);
		}
	}

	list(): Note[] {
		const out: Note[] = [];
		for (const e of this.byCode.values()) {
			const note: Note = { code: e.code, message: e.message };
			if (e.facetIds) note.facetIds = e.facetIds;
			// A path names one field; a note gathered from several facets has none.
			if (e.count === 1) {
				if (e.path !== undefined) note.path = e.path;
				else if (e.field !== undefined) note.path = `facets.${e.facetIndex}.${e.field}`;
			}
			out.push(note);
		}
		return out;
	}
}
