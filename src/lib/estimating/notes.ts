import type { Note } from './types';

/** Collects notes by code so one message lists every facet it applies to, in input order. */
export class NoteCollector {
	private readonly byCode = new Map<string, Note>();

	add(code: string, message: string, facetId?: string, path?: string): void {
		const existing = this.byCode.get(code);
		if (!existing) {
			const note: Note = { code, message };
			if (facetId !== undefined) note.facetIds = [facetId];
			if (path !== undefined) note.path = path;
			this.byCode.set(code, note);
		} else if (facetId !== undefined) {
			(existing.facetIds ??= []).push(facetId);
			// A path names one field; a note about several facets has none.
			delete existing.path;
		}
	}

	list(): Note[] {
		return [...this.byCode.values()];
	}
}
