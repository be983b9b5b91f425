/**
 * Exact unit definitions. NIST Handbook 44, Appendix C ("General Tables of Units of Measurement")
 * and NIST SP 811 define these as exact, so conversions never lose more than float rounding.
 */

/** International foot (the US survey foot was retired at the end of 2022). */
export const M_PER_FT = 0.3048;
export const M_PER_IN = 0.0254;
export const M2_PER_FT2 = 0.09290304;
/** A roofing square is 100 ft² of roof surface. */
export const FT2_PER_SQUARE = 100;
export const M2_PER_SQUARE = 9.290304;
/** US liquid gallon: 231 in³. */
export const L_PER_GAL = 3.785411784;
export const FL_OZ_PER_GAL = 128;
export const ML_PER_FL_OZ = 29.5735295625;
export const MIN_PER_HOUR = 60;

export const m2ToFt2 = (m2: number): number => m2 / M2_PER_FT2;
export const mToFt = (m: number): number => m / M_PER_FT;
export const ft2ToSquares = (ft2: number): number => ft2 / FT2_PER_SQUARE;
export const galToL = (gal: number): number => gal * L_PER_GAL;
export const flOzToGal = (oz: number): number => oz / FL_OZ_PER_GAL;
