import { describe, expect, it } from 'vitest';
import * as u from '../../../src/lib/estimating/units';

// Source: NIST Handbook 44, Appendix C "General Tables of Units of Measurement" (exact
// definitions), and NIST SP 811; roofing square per JLC "Asphalt Shingles Field Guide".
describe('NIST Handbook 44 Appendix C conversions', () => {
	it('1 ft = 0.3048 m and 1 in = 2.54 cm exactly', () => {
		expect(u.M_PER_FT).toBe(0.3048);
		expect(u.M_PER_IN).toBe(0.0254);
		expect(u.M_PER_FT / 12).toBeCloseTo(u.M_PER_IN, 15);
		expect(u.mToFt(0.3048)).toBe(1);
		expect(u.mToFt(1)).toBeCloseTo(3.280839895013123, 12);
	});

	it('1 ft² = 0.09290304 m² = (0.3048 m)²', () => {
		expect(u.M2_PER_FT2).toBe(0.09290304);
		expect(u.M_PER_FT * u.M_PER_FT).toBeCloseTo(u.M2_PER_FT2, 16);
		expect(u.m2ToFt2(0.09290304)).toBe(1);
		expect(u.m2ToFt2(1)).toBeCloseTo(10.763910416709722, 10);
	});

	it('1 roofing square = 100 ft² = 9.290304 m²', () => {
		expect(u.FT2_PER_SQUARE).toBe(100);
		expect(u.M2_PER_SQUARE).toBe(9.290304);
		expect(u.ft2ToSquares(u.m2ToFt2(u.M2_PER_SQUARE))).toBeCloseTo(1, 14);
	});

	it('1 US gal = 231 in³ = 3.785411784 L', () => {
		expect(u.L_PER_GAL).toBe(3.785411784);
		const in3InLitres = 2.54 ** 3 / 1000;
		expect(231 * in3InLitres).toBeCloseTo(u.L_PER_GAL, 12);
		expect(u.galToL(100)).toBeCloseTo(378.5411784, 9);
	});

	it('1 US fl oz = 1/128 gal = 29.5735295625 mL', () => {
		expect(u.FL_OZ_PER_GAL).toBe(128);
		expect(u.ML_PER_FL_OZ).toBe(29.5735295625);
		expect((u.L_PER_GAL * 1000) / u.FL_OZ_PER_GAL).toBeCloseTo(u.ML_PER_FL_OZ, 10);
		expect(u.flOzToGal(128)).toBe(1);
	});
});
