import { z } from 'zod';

/** Fewer site-visit facets than this say too little to move the cuts. */
export const MIN_CALIBRATION_FACETS = 5;

const figure = z.number().finite().min(0);
const count = z.number().int().min(0);

/**
 * The company's fitted growth-suggestion cuts as stored (companies.growth_calibration), with what
 * they were fitted on. Checked on every read: a row that does not pass means the defaults.
 */
export const storedGrowthCalibrationSchema = z.strictObject({
	cuts: z
		.tuple([figure.max(100), figure.max(100), figure.max(100), figure.max(100)])
		.refine((c) => c.every((v, i) => i === 0 || v >= c[i - 1]), { error: 'cuts must rise' }),
	calibratedAt: z.iso.datetime(),
	samples: count.min(MIN_CALIBRATION_FACETS),
	exactBefore: count,
	exactAfter: count,
	errorBefore: count,
	errorAfter: count
});

export type StoredGrowthCalibration = z.infer<typeof storedGrowthCalibrationSchema>;

/** What the Settings page shows of the calibration. */
export interface GrowthCalibrationView {
	/** null: the shipped defaults are in use. */
	stored: StoredGrowthCalibration | null;
	cuts: [number, number, number, number];
	/** Facets graded on a confirmed site visit that carry a suggestion's measures. */
	available: number;
}
