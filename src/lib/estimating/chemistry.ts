import type { RateCard } from './rate-card';
import type { Batch } from './types';
import { flOzToGal } from './units';
import { strengthKey } from './growth';

/** C1·V1 = C2·V2: volume of stock at C1 that gives V2 of mix at C2 (same basis, e.g. trade %). */
export function stockVolume(targetPct: number, mixVolume: number, stockPct: number): number {
	return (targetPct * mixVolume) / stockPct;
}

/** Gallons of finished mix for one facet: squares × coverage × applications (before waste). */
export function facetMixGal(
	squares: number,
	coverageGalPerSquare: number,
	applications: number
): number {
	return squares * coverageGalPerSquare * applications;
}

/** What a batch needs from a facet (a FacetResult is one). */
export interface MixNeed {
	id: string;
	mixStrengthPct: number;
	mixGal: number;
}

export interface BatchProblem {
	strengthPct: number;
	facetIds: string[];
	message: string;
}

/**
 * One batch per distinct strength (common practice: a premix tank holds one strength).
 * Waste is added per batch; stock by C1·V1 = C2·V2; surfactant by dose; water by difference,
 * so stock + water + surfactant = mix exactly.
 */
export function buildBatches(
	needs: readonly MixNeed[],
	stockStrengthPct: number,
	chem: RateCard['chemistry']
): { batches: Batch[]; problems: BatchProblem[] } {
	const byKey = new Map<number, { strengthPct: number; gal: number; facetIds: string[] }>();
	for (const need of needs) {
		const key = strengthKey(need.mixStrengthPct);
		let b = byKey.get(key);
		if (!b) {
			b = { strengthPct: key, gal: 0, facetIds: [] };
			byKey.set(key, b);
		}
		b.gal += need.mixGal;
		b.facetIds.push(need.id);
	}
	const groups = [...byKey.values()].sort((a, b) => a.strengthPct - b.strengthPct);
	const batches: Batch[] = [];
	const problems: BatchProblem[] = [];
	const wasteFactor = 1 + chem.wastePct / 100;
	for (const g of groups) {
		const mixGal = g.gal * wasteFactor;
		if (g.strengthPct >= stockStrengthPct) {
			problems.push({
				strengthPct: g.strengthPct,
				facetIds: g.facetIds,
				message: `a ${g.strengthPct}% mix cannot be made from ${stockStrengthPct}% stock: the stock must be stronger than the mix`
			});
			continue;
		}
		const stockGal = stockVolume(g.strengthPct, mixGal, stockStrengthPct);
		const surfactantOz = chem.surfactantOzPerGal * mixGal;
		const waterGal = mixGal - stockGal - flOzToGal(surfactantOz);
		if (waterGal < 0) {
			problems.push({
				strengthPct: g.strengthPct,
				facetIds: g.facetIds,
				message: `a ${g.strengthPct}% mix from ${stockStrengthPct}% stock leaves no room for the surfactant dose; use stronger stock`
			});
			continue;
		}
		batches.push({
			strengthPct: g.strengthPct,
			mixGal,
			stockGal,
			waterGal,
			surfactantOz,
			facetIds: g.facetIds
		});
	}
	return { batches, problems };
}

/** Plant pre-wet and post-rinse water, from eave length (where runoff lands). */
export function waterForSite(
	eaveLengthFt: number,
	chem: RateCard['chemistry'],
	noGutters: boolean
): { preWetGal: number; rinseGal: number } {
	const preWet = eaveLengthFt * chem.preWetGalPerEaveFt;
	return {
		preWetGal: noGutters ? preWet * chem.noGuttersPreWetMultiplier : preWet,
		rinseGal: eaveLengthFt * chem.rinseGalPerEaveFt
	};
}

/**
 * The crew's batches for the stock they measured on the day. Each batch keeps its strength, its
 * volume of finished mix and its surfactant dose; only the split between stock and water moves
 * (C1·V1 = C2·V2 again, from the measured C1). A batch the measured stock can no longer make is
 * returned as a problem, never as a recipe.
 */
export function rebatchForStock(
	batches: readonly Batch[],
	measuredStockPct: number
): { batches: Batch[]; problems: BatchProblem[] } {
	const out: Batch[] = [];
	const problems: BatchProblem[] = [];
	for (const b of batches) {
		if (b.strengthPct >= measuredStockPct) {
			problems.push({
				strengthPct: b.strengthPct,
				facetIds: b.facetIds,
				message: `a ${b.strengthPct}% mix cannot be made from stock measured at ${measuredStockPct}%: the stock must be stronger than the mix`
			});
			continue;
		}
		const stockGal = stockVolume(b.strengthPct, b.mixGal, measuredStockPct);
		const waterGal = b.mixGal - stockGal - flOzToGal(b.surfactantOz);
		if (waterGal < 0) {
			problems.push({
				strengthPct: b.strengthPct,
				facetIds: b.facetIds,
				message: `a ${b.strengthPct}% mix from stock measured at ${measuredStockPct}% leaves no room for the surfactant dose; use stronger stock`
			});
			continue;
		}
		out.push({ ...b, stockGal, waterGal, facetIds: [...b.facetIds] });
	}
	return { batches: out, problems };
}
