import { facetSchema } from '../schemas/facet';
import type { PlanFacet } from '../schemas/roof-plan';
import type { UnitSystem } from './format';

/**
 * What the roof editor keeps on this device: a copy of unsaved facets per site (so a lost
 * connection or a closed tab costs nothing) and the chosen units. Storage can be full, disabled or
 * hold anything a user or an older build put there, so every read is checked and no call throws.
 */

export type LocalDraft = { facets: PlanFacet[]; baseVersion: number | null; savedAt: string };

const draftKey = (siteId: string) => `clearpitch:roof-draft:${siteId}`;
const UNITS_KEY = 'clearpitch:units';

export function writeDraft(
	siteId: string,
	facets: readonly PlanFacet[],
	baseVersion: number | null
) {
	try {
		localStorage.setItem(
			draftKey(siteId),
			JSON.stringify({ facets, baseVersion, savedAt: new Date().toISOString() })
		);
	} catch {
		/* storage full or disabled: the save button still works */
	}
}

export function clearDraft(siteId: string) {
	try {
		localStorage.removeItem(draftKey(siteId));
	} catch {
		/* storage disabled: nothing was kept */
	}
}

/**
 * The draft to offer for this site, if it was made on top of the version now latest; a draft made
 * on another version (or unreadable) is dropped, since restoring it would undo someone's save.
 */
export function readDraft(siteId: string, latest: number | null): LocalDraft | null {
	try {
		const raw = localStorage.getItem(draftKey(siteId));
		if (!raw) return null;
		const d = JSON.parse(raw) as Partial<LocalDraft>;
		if (d.baseVersion === latest && Array.isArray(d.facets) && d.facets.length) {
			return { facets: d.facets, baseVersion: d.baseVersion, savedAt: String(d.savedAt) };
		}
	} catch {
		/* unreadable: dropped below */
	}
	clearDraft(siteId);
	return null;
}

/** Only the facets that still pass the plan's schema come back from a draft. */
export function checkedDraftFacets(d: LocalDraft): PlanFacet[] {
	return d.facets.flatMap((f) => {
		const r = facetSchema.safeParse(f);
		return r.success ? [r.data] : [];
	});
}

export function readUnits(): UnitSystem | null {
	try {
		const u = localStorage.getItem(UNITS_KEY);
		return u === 'metric' || u === 'imperial' ? u : null;
	} catch {
		return null;
	}
}

export function writeUnits(u: UnitSystem) {
	try {
		localStorage.setItem(UNITS_KEY, u);
	} catch {
		/* storage disabled: the choice lasts for this visit */
	}
}
