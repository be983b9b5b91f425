import { z } from 'zod';
import { DWELL_CAP_MINUTES, type RateCard } from '../estimating/rate-card';
import { ACCESS_GRADES, GROWTH_GRADES, MATERIALS } from '../estimating/types';

/**
 * The rate card as the Rates page edits it. Every message names its field so the page can put
 * it beside the input; the path (e.g. materials.slate.maxStrengthPct) says where.
 */

const num = (field: string, min: number, max: number, unit = '') =>
	z
		.number({
			error: (iss) =>
				iss.input === undefined ? `${field} is required` : `${field} must be a number`
		})
		.min(min, { error: `${field} must be at least ${min}${unit}` })
		.max(max, { error: `${field} must be at most ${max}${unit}` });

const int = (field: string, min: number, max: number, unit = '') =>
	num(field, min, max, unit).int({
		error: `${field} must be a whole number${unit ? ` of${unit}` : ''}`
	});

const pct = (field: string, max = 100) => num(field, 0, max, '%');
const strength = (field: string) => num(field, 0, 20, '%');
const multiplier = (field: string) => num(field, 0.1, 10);
const cents = (field: string, max = 100_000_00) => int(field, 0, max, ' cents');
const hours = (field: string) => num(field, 0, 24, ' h');

const materialRateSchema = z
	.strictObject({
		perSquareCents: cents('perSquareCents', 10_000_00),
		minStrengthPct: strength('minStrengthPct'),
		maxStrengthPct: strength('maxStrengthPct'),
		baseStrengthPct: strength('baseStrengthPct'),
		coverageGalPerSquare: num('coverageGalPerSquare', 0.01, 20, ' gal'),
		productionSquaresPerHour: num('productionSquaresPerHour', 0.1, 200, ' squares/h')
	})
	.superRefine((m, ctx) => {
		if (m.minStrengthPct > m.maxStrengthPct) {
			ctx.addIssue({
				code: 'custom',
				path: ['minStrengthPct'],
				message: 'minStrengthPct must not be above maxStrengthPct'
			});
		}
		if (m.baseStrengthPct < m.minStrengthPct || m.baseStrengthPct > m.maxStrengthPct) {
			ctx.addIssue({
				code: 'custom',
				path: ['baseStrengthPct'],
				message: 'baseStrengthPct must lie between minStrengthPct and maxStrengthPct'
			});
		}
	});

const growthRateSchema = z.strictObject({
	strengthStepPct: num('strengthStepPct', -10, 10, ' points'),
	applications: int('applications', 1, 5),
	priceMultiplier: multiplier('priceMultiplier'),
	labourFactor: multiplier('labourFactor')
});

const pairSchema = z.strictObject({
	priceMultiplier: multiplier('priceMultiplier'),
	labourMultiplier: multiplier('labourMultiplier')
});

const rangeSchema = z.strictObject({
	lowPct: pct('lowPct', 50),
	highPct: pct('highPct')
});

const byKey = <K extends string, S extends z.ZodType>(keys: readonly K[], schema: S) =>
	z.strictObject(Object.fromEntries(keys.map((k) => [k, schema])) as Record<K, S>);

export const rateCardSchema = z
	.strictObject({
		materials: byKey(MATERIALS, materialRateSchema),
		growth: byKey(GROWTH_GRADES, growthRateSchema),
		access: byKey(ACCESS_GRADES, pairSchema),
		stories: byKey(['1', '2', '3'] as const, pairSchema),
		ladder: z.strictObject({
			setupMinutes: num('setupMinutes', 0, 240, ' min'),
			eaveFtPerPlacement: num('eaveFtPerPlacement', 1, 500, ' ft')
		}),
		lift: z.strictObject({ chargeCents: cents('chargeCents') }),
		steepPitch: z.strictObject({
			thresholdRise: num('thresholdRise', 0, 24, ' in per 12'),
			priceMultiplier: multiplier('priceMultiplier'),
			setupHours: hours('setupHours')
		}),
		testSpot: z
			.strictObject({
				quickSeconds: num('quickSeconds', 0, 3600, ' s'),
				slowSeconds: num('slowSeconds', 0, 3600, ' s'),
				adjustStepPct: num('adjustStepPct', 0, 10, ' points')
			})
			.refine((t) => t.quickSeconds <= t.slowSeconds, {
				path: ['quickSeconds'],
				message: 'quickSeconds must not be above slowSeconds'
			}),
		minimumJobCents: cents('minimumJobCents'),
		tripChargeCents: cents('tripChargeCents'),
		postRinseCentsPerFt2: num('postRinseCentsPerFt2', 0, 1000, ' cents'),
		depositPct: pct('depositPct'),
		range: z.strictObject({ remote: rangeSchema, confirmed: rangeSchema }),
		labour: z.strictObject({
			centsPerTechnicianHour: cents('centsPerTechnicianHour', 1000_00),
			crewSize: int('crewSize', 1, 20),
			setupHours: hours('setupHours'),
			rinseMinutesPerSquare: num('rinseMinutesPerSquare', 0, 120, ' min')
		}),
		overheadPct: pct('overheadPct'),
		chemistry: z.strictObject({
			stockStrengthPct: num('stockStrengthPct', 0.1, 100, '%'),
			stockCentsPerGal: num('stockCentsPerGal', 0, 100_00, ' cents'),
			surfactantOzPerGal: num('surfactantOzPerGal', 0, 16, ' fl oz'),
			surfactantCentsPerOz: num('surfactantCentsPerOz', 0, 10_00, ' cents'),
			wastePct: pct('wastePct'),
			preWetGalPerEaveFt: num('preWetGalPerEaveFt', 0, 100, ' gal'),
			rinseGalPerEaveFt: num('rinseGalPerEaveFt', 0, 100, ' gal'),
			noGuttersPreWetMultiplier: multiplier('noGuttersPreWetMultiplier'),
			// Cards saved before this figure existed take the trade's ceiling.
			dwellMinutes: num('dwellMinutes', 1, DWELL_CAP_MINUTES, ' min').default(DWELL_CAP_MINUTES)
		}),
		maxDiscountPct: pct('maxDiscountPct'),
		taxPct: pct('taxPct', 50)
	})
	.superRefine((card, ctx) => {
		// A mix at or above the stock's strength cannot be made from it.
		for (const m of MATERIALS) {
			if (card.materials[m].maxStrengthPct >= card.chemistry.stockStrengthPct) {
				ctx.addIssue({
					code: 'custom',
					path: ['materials', m, 'maxStrengthPct'],
					message: `maxStrengthPct must be below the stock strength (${card.chemistry.stockStrengthPct}%)`
				});
			}
		}
	}) satisfies z.ZodType<RateCard>; // a parsed card is exactly what the model takes
