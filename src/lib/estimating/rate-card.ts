import type { AccessGrade, GrowthGrade, Material } from './types';

export interface MaterialRate {
	perSquareCents: number;
	minStrengthPct: number;
	maxStrengthPct: number;
	/** Strength for a G1 facet before the grade step. */
	baseStrengthPct: number;
	/** Gallons of finished mix per square per application. */
	coverageGalPerSquare: number;
	/** Squares per crew hour at ground access, one storey, G1. */
	productionSquaresPerHour: number;
}

export interface GrowthRate {
	/** Percentage points added to the material's base strength. */
	strengthStepPct: number;
	applications: number;
	priceMultiplier: number;
	labourFactor: number;
}

export interface MultiplierPair {
	priceMultiplier: number;
	labourMultiplier: number;
}

export interface RangePcts {
	lowPct: number;
	highPct: number;
}

/** Every figure the model uses. The owner edits all of them; nothing is hard-coded in the model. */
export interface RateCard {
	materials: Record<Material, MaterialRate>;
	growth: Record<GrowthGrade, GrowthRate>;
	access: Record<AccessGrade, MultiplierPair>;
	stories: Record<'1' | '2' | '3', MultiplierPair>;
	ladder: { setupMinutes: number; eaveFtPerPlacement: number };
	lift: { chargeCents: number };
	steepPitch: {
		/** Facets with a rise above this (per 12) are steep. */
		thresholdRise: number;
		priceMultiplier: number;
		/** Anchors and harness set-up, once per job with any steep facet. */
		setupHours: number;
	};
	testSpot: {
		/** Colour change at or under this many seconds counts as quick. */
		quickSeconds: number;
		/** Colour change over this many seconds counts as slow. */
		slowSeconds: number;
		adjustStepPct: number;
	};
	minimumJobCents: number;
	tripChargeCents: number;
	postRinseCentsPerFt2: number;
	depositPct: number;
	range: { remote: RangePcts; confirmed: RangePcts };
	labour: {
		centsPerTechnicianHour: number;
		crewSize: number;
		/** Arrival, plant pre-wet, tarps, teardown: once per job, crew hours. */
		setupHours: number;
		rinseMinutesPerSquare: number;
	};
	overheadPct: number;
	chemistry: {
		stockStrengthPct: number;
		stockCentsPerGal: number;
		surfactantOzPerGal: number;
		surfactantCentsPerOz: number;
		wastePct: number;
		preWetGalPerEaveFt: number;
		rinseGalPerEaveFt: number;
		/** Pre-wet water is multiplied by this where runoff falls straight onto beds. */
		noGuttersPreWetMultiplier: number;
		/**
		 * Longest a coat may dwell before it is rinsed or re-wetted, in minutes. Never over
		 * DWELL_CAP_MINUTES; the product label may allow less, and then the label rules.
		 */
		dwellMinutes: number;
	};
	maxDiscountPct: number;
	taxPct: number;
}

/**
 * The trade's ceiling on dwell per coat: "≤ 12–15 min" (common practice, no outside source;
 * docs/estimating-model.md, growth grades). A card may set less, never more.
 */
export const DWELL_CAP_MINUTES = 15;

/**
 * A card as stored by an earlier version of Clearpitch, brought up to the current shape: figures
 * added since then take their default, so an old estimate's card still prices and its sheet
 * still reads.
 */
export function upgradeRateCard(stored: RateCard): RateCard {
	const chemistry: Partial<RateCard['chemistry']> = stored.chemistry;
	return {
		...stored,
		chemistry: { ...stored.chemistry, dwellMinutes: chemistry.dwellMinutes ?? DWELL_CAP_MINUTES }
	};
}

/**
 * Demo defaults, from memory, not advice (docs/estimating-model.md §12 "Default rate card").
 * Figures the table does not give (base strengths, grade steps and applications, set-up and
 * rinse times, chemical prices, water per ft of eave, discount cap) are demo defaults chosen
 * within the ranges docs/estimating-model.md §12 gives, also from memory.
 */
export const DEFAULT_RATE_CARD: RateCard = {
	materials: {
		// demo default, from memory
		asphalt_shingle: {
			perSquareCents: 3200,
			minStrengthPct: 3,
			maxStrengthPct: 5,
			baseStrengthPct: 3,
			coverageGalPerSquare: 1.5,
			productionSquaresPerHour: 14
		},
		// demo default, from memory; several light coats beat flooding
		clay_tile: {
			perSquareCents: 4500,
			minStrengthPct: 3,
			maxStrengthPct: 5,
			baseStrengthPct: 4,
			coverageGalPerSquare: 1.0,
			productionSquaresPerHour: 9
		},
		// demo default, from memory; porous, soaks mix
		concrete_tile: {
			perSquareCents: 4200,
			minStrengthPct: 4,
			maxStrengthPct: 6,
			baseStrengthPct: 4,
			coverageGalPerSquare: 2.5,
			productionSquaresPerHour: 8
		},
		// demo default, from memory
		metal: {
			perSquareCents: 3000,
			minStrengthPct: 2,
			maxStrengthPct: 4,
			baseStrengthPct: 2,
			coverageGalPerSquare: 0.75,
			productionSquaresPerHour: 16
		},
		// demo default, from memory
		slate: {
			perSquareCents: 5500,
			minStrengthPct: 3,
			maxStrengthPct: 4,
			baseStrengthPct: 3,
			coverageGalPerSquare: 1.0,
			productionSquaresPerHour: 6
		},
		// demo default, from memory; low strength or another chemistry
		wood_shake: {
			perSquareCents: 5000,
			minStrengthPct: 1,
			maxStrengthPct: 2,
			baseStrengthPct: 1,
			coverageGalPerSquare: 3.0,
			productionSquaresPerHour: 6
		}
	},
	growth: {
		// demo defaults, from memory: price multipliers and strength steps as in
		// docs/estimating-model.md §12
		G0: { strengthStepPct: -1, applications: 1, priceMultiplier: 0.8, labourFactor: 0.9 },
		G1: { strengthStepPct: 0, applications: 1, priceMultiplier: 1.0, labourFactor: 1.0 },
		G2: { strengthStepPct: 1, applications: 1, priceMultiplier: 1.15, labourFactor: 1.15 },
		G3: { strengthStepPct: 2, applications: 2, priceMultiplier: 1.35, labourFactor: 1.3 },
		G4: { strengthStepPct: 3, applications: 2, priceMultiplier: 1.6, labourFactor: 1.6 }
	},
	access: {
		// demo defaults, from memory
		ground: { priceMultiplier: 1.0, labourMultiplier: 1.0 },
		ladder: { priceMultiplier: 1.3, labourMultiplier: 1.3 },
		roof: { priceMultiplier: 1.1, labourMultiplier: 1.1 },
		lift: { priceMultiplier: 1.5, labourMultiplier: 1.5 }
	},
	stories: {
		// demo defaults, from memory
		'1': { priceMultiplier: 1.0, labourMultiplier: 1.0 },
		'2': { priceMultiplier: 1.25, labourMultiplier: 1.25 },
		'3': { priceMultiplier: 1.6, labourMultiplier: 1.6 }
	},
	ladder: { setupMinutes: 10, eaveFtPerPlacement: 25 }, // demo default, from memory
	lift: { chargeCents: 25000 }, // demo default, from memory
	steepPitch: { thresholdRise: 8, priceMultiplier: 1.2, setupHours: 0.5 }, // demo default, from memory
	testSpot: { quickSeconds: 45, slowSeconds: 90, adjustStepPct: 1 }, // demo default, from memory
	minimumJobCents: 39500, // demo default, from memory
	tripChargeCents: 0, // demo default, from memory ($0 inside 15 miles)
	postRinseCentsPerFt2: 4, // demo default, from memory
	depositPct: 25, // demo default, from memory
	range: {
		remote: { lowPct: 10, highPct: 15 }, // demo default, from memory
		confirmed: { lowPct: 3, highPct: 5 } // demo default, from memory
	},
	labour: {
		centsPerTechnicianHour: 3800, // demo default, from memory
		crewSize: 2, // demo default, from memory
		setupHours: 1.0, // demo default, from memory (docs/estimating-model.md §12: ~0.75–1.5 h)
		rinseMinutesPerSquare: 1 // demo default, from memory
	},
	overheadPct: 12, // demo default, from memory
	chemistry: {
		stockStrengthPct: 12.5, // demo default, from memory (trade %)
		stockCentsPerGal: 500, // demo default, from memory
		surfactantOzPerGal: 1, // demo default, from memory
		surfactantCentsPerOz: 30, // demo default, from memory
		wastePct: 10, // demo default, from memory
		preWetGalPerEaveFt: 0.5, // demo default, from memory
		rinseGalPerEaveFt: 0.5, // demo default, from memory
		noGuttersPreWetMultiplier: 2, // demo default, from memory
		dwellMinutes: DWELL_CAP_MINUTES
	},
	maxDiscountPct: 15, // demo default, from memory
	taxPct: 0 // demo default, from memory
};

/** A deep copy, so a caller can change one figure without touching the default. */
export function cloneRateCard(card: RateCard = DEFAULT_RATE_CARD): RateCard {
	return JSON.parse(JSON.stringify(card)) as RateCard;
}
