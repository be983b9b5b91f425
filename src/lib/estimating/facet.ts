import { ladderPlacements } from './access';
import { facetMixGal } from './chemistry';
import { eaveLength, type FacetPlan } from './geometry';
import { applyTestSpot, suggestStrength, type TestSpotEffect } from './growth';
import { applicationHours, ladderHours } from './labour';
import { pitchMultiplier } from './pitch';
import { facetPriceCents } from './pricing';
import type { MultiplierPair, RateCard } from './rate-card';
import type { FacetInput, FacetResult, Stories, TestSpot } from './types';
import { ft2ToSquares } from './units';

export function storyRate(card: RateCard, n: Stories): MultiplierPair {
	return n === 1 ? card.stories['1'] : n === 2 ? card.stories['2'] : card.stories['3'];
}

export interface FacetFigures {
	result: FacetResult;
	/** Application crew hours, ladder set-ups excluded. */
	applicationHours: number;
	testSpotEffect: TestSpotEffect;
	testSpotCapped: boolean;
}

/** Every figure for one facet from its measured plan and the card. */
export function facetFigures(
	f: FacetInput,
	plan: FacetPlan,
	card: RateCard,
	spot: TestSpot | undefined
): FacetFigures {
	const mat = card.materials[f.material];
	const gr = card.growth[f.growth];
	const ac = card.access[f.access];
	const st = storyRate(card, f.stories);

	const pitchMult = pitchMultiplier(f.pitch);
	const sloped = plan.planAreaFt2 * pitchMult;
	const squares = ft2ToSquares(sloped);
	const steep = f.pitch > card.steepPitch.thresholdRise;

	const decision = applyTestSpot(suggestStrength(mat, gr), mat, spot, card.testSpot);
	const eave = eaveLength(plan.segmentLengthsFt, f.edges);
	const ladders = ladderPlacements(f.access, eave.eaveLengthFt, card.ladder.eaveFtPerPlacement);
	const hours = applicationHours({
		squares,
		applications: gr.applications,
		productionSquaresPerHour: mat.productionSquaresPerHour,
		accessLabourMultiplier: ac.labourMultiplier,
		storyLabourMultiplier: st.labourMultiplier,
		growthLabourFactor: gr.labourFactor
	});
	const priceCents = facetPriceCents({
		squares,
		perSquareCents: mat.perSquareCents,
		growthMultiplier: gr.priceMultiplier,
		accessMultiplier: ac.priceMultiplier,
		storyMultiplier: st.priceMultiplier,
		steepMultiplier: steep ? card.steepPitch.priceMultiplier : 1
	});
	return {
		result: {
			id: f.id,
			label: f.label,
			material: f.material,
			growth: f.growth,
			access: f.access,
			stories: f.stories,
			pitch: f.pitch,
			planAreaFt2: plan.planAreaFt2,
			pitchMultiplier: pitchMult,
			slopedAreaFt2: sloped,
			squares,
			mixStrengthPct: decision.strengthPct,
			suggestedStrengthPct: decision.suggestedPct,
			applications: gr.applications,
			coverageGalPerSquare: mat.coverageGalPerSquare,
			mixGal: facetMixGal(squares, mat.coverageGalPerSquare, gr.applications),
			eaveLengthFt: eave.eaveLengthFt,
			eaveEstimated: eave.estimated,
			perimeterFt: plan.perimeterFt,
			ladderPlacements: ladders,
			labourHours: hours + ladderHours(ladders, card.ladder.setupMinutes),
			steep,
			priceCents
		},
		applicationHours: hours,
		testSpotEffect: decision.effect,
		testSpotCapped: decision.capped
	};
}
