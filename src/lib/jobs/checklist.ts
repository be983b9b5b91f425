import type { JobLogState } from '../types/job';

export interface ChecklistItem {
	key: string;
	label: string;
}

/** The facets as the sheet numbers them: 1, 2, … in the roof plan's order. */
export interface NumberedFacet {
	id: string;
	n: number;
	label?: string;
}

/**
 * The day's checklist: the site steps in the order they are done, with one line per facet
 * between the test spot and the final rinse.
 */
export function checklistItems(facets: readonly NumberedFacet[]): ChecklistItem[] {
	return [
		{ key: 'prewet', label: 'Pre-wet plants, lawn and beds' },
		{
			key: 'cover',
			label: 'Cover what must be covered (plants, drains, vents, ponds); downspouts diverted'
		},
		{ key: 'testspot', label: 'Test spot done' },
		...facets.map((f) => ({
			key: `facet:${f.id}`,
			label: `Facet ${f.n}${f.label ? ` (${f.label})` : ''} done`
		})),
		{ key: 'rinse', label: 'Final rinse of plants, windows and paths' },
		{ key: 'walkround', label: 'Walk-round with the customer' }
	];
}

/** Items not yet ticked. Keys the list doesn't know are ignored, not counted. */
export function unticked(
	items: readonly ChecklistItem[],
	ticks: Record<string, boolean>
): ChecklistItem[] {
	return items.filter((i) => ticks[i.key] !== true);
}

export const MIN_REASON_LENGTH = 10;

export type DoneCheck = { ok: true } | { ok: false; missing: string[] };

/**
 * A job may be marked done with the whole checklist ticked and at least one after photo, or
 * with a written reason for what is missing (a customer not home for the walk-round, a camera
 * that died). The reason must say something: at least MIN_REASON_LENGTH characters.
 */
export function checkDone(input: {
	items: readonly ChecklistItem[];
	log: Pick<JobLogState, 'checklist'>;
	afterPhotos: number;
	reason: string | null | undefined;
}): DoneCheck {
	const reason = input.reason?.trim() ?? '';
	if (reason.length >= MIN_REASON_LENGTH) return { ok: true };
	const missing = unticked(input.items, input.log.checklist).map((i) => i.label);
	if (input.afterPhotos < 1) missing.push('At least one after photo');
	return missing.length === 0 ? { ok: true } : { ok: false, missing };
}

export const EMPTY_LOG: JobLogState = {
	checklist: {},
	stockGalUsed: null,
	surfactantOzUsed: null,
	measuredStockPct: null,
	notes: ''
};
