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

/**
 * How a note names a facet to the people reading it: the label the estimator gave it, or its
 * place in the plan ("Facet 2"). Internal ids are for software and stay in `facetIds`.
 */
export function facetName(facet: { label?: string }, index: number): string {
	const label = facet.label?.trim();
	return label ? label : `Facet ${index + 1}`;
}

/** Every facet's name by id, in input order (a repeated id keeps its first name). */
export function facetNames(
	facets: ReadonlyArray<{ id: string; label?: string }>
): Map<string, string> {
	const names = new Map<string, string>();
	facets.forEach((f, i) => {
		if (!names.has(f.id)) names.set(f.id, facetName(f, i));
	});
	return names;
}

/** Collects notes by code so one message lists every facet it applies to, in input order. */
export class NoteCollector {
	private readonly byCode = new Map<string, Entry>();

	/** `names` maps a facet id to the name notes show for it (see facetNames). */
	constructor(private readonly names: ReadonlyMap<string, string> = new Map()) {}

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
			if (e.facetIds) {
				note.facetIds = e.facetIds;
				note.facets = e.facetIds.map((id) => this.names.get(id) ?? id);
			}
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
