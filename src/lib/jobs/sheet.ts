import { NOT_WALKABLE } from '../estimating/access';
import { DWELL_CAP_MINUTES } from '../estimating/rate-card';
import type { EstimateResult } from '../estimating/types';

/**
 * Longest a coat may dwell before it is rinsed or re-wetted, as the sheet shows it: the rate
 * card's dwell setting the estimate was priced with, never over the trade's ceiling (≤ 12–15 min
 * per coat, common practice, no outside source). The product label may allow less, and the sheet
 * says so beside it. Results priced before the card had the setting take the ceiling.
 */
export function dwellLimitMinutes(chemistry: { dwellMinutes?: number }): number {
	return Math.min(DWELL_CAP_MINUTES, chemistry.dwellMinutes ?? DWELL_CAP_MINUTES);
}

export interface SheetFacet {
	id: string;
	n: number;
	name: string;
	material: string;
	pitch: number;
	squares: number;
	growth: string;
	access: string;
	mixStrengthPct: number;
	applications: number;
	ladderPlacements: number;
	steep: boolean;
	fragile: boolean;
}

export function sheetFacets(result: EstimateResult): SheetFacet[] {
	return result.facets.map((f, i) => ({
		id: f.id,
		n: i + 1,
		name: f.label ? `${i + 1} · ${f.label}` : `${i + 1}`,
		material: f.material,
		pitch: f.pitch,
		squares: f.squares,
		growth: f.growth,
		access: f.access,
		mixStrengthPct: f.mixStrengthPct,
		applications: f.applications,
		ladderPlacements: f.ladderPlacements,
		steep: f.steep,
		fragile: NOT_WALKABLE.has(f.material)
	}));
}

export interface Hazard {
	code: string;
	message: string;
	facets: number[];
}

/**
 * The crew's hazard lines: steep and fragile facets by number, then the model's own warnings
 * (ladder work, runoff, steep-roof fall protection, metal and wood shake), in that order.
 */
export function hazards(result: EstimateResult): Hazard[] {
	const rows = sheetFacets(result);
	const numbers = new Map(rows.map((r) => [r.id, r.n]));
	const out: Hazard[] = [];
	const steep = rows.filter((r) => r.steep).map((r) => r.n);
	if (steep.length) {
		out.push({
			code: 'sheet.steep',
			message:
				'Steep facets: anchors and harness before anyone goes up; a wet, soaped roof is slick.',
			facets: steep
		});
	}
	const fragile = rows.filter((r) => r.fragile).map((r) => r.n);
	if (fragile.length) {
		out.push({
			code: 'sheet.fragile',
			message:
				'Fragile tile or slate: do not walk it. Work from a ladder at the eave, a roof ladder or a lift; if you must step, only on the lower 3 in of a tile.',
			facets: fragile
		});
	}
	for (const w of result.warnings) {
		out.push({
			code: w.code,
			message: w.message.charAt(0).toUpperCase() + w.message.slice(1),
			facets: (w.facetIds ?? []).map((id) => numbers.get(id) ?? 0).filter((n) => n > 0)
		});
	}
	return out;
}
