import { M2_PER_FT2, M_PER_FT } from '../estimating/units';

/** How the editor shows areas and lengths. Stored values are always ft² / ft. */
export type UnitSystem = 'imperial' | 'metric';

const whole = new Intl.NumberFormat('en-US', { maximumFractionDigits: 0 });
const one = new Intl.NumberFormat('en-US', { minimumFractionDigits: 1, maximumFractionDigits: 1 });
const two = new Intl.NumberFormat('en-US', { minimumFractionDigits: 2, maximumFractionDigits: 2 });

export function formatArea(ft2: number, units: UnitSystem): string {
	if (!Number.isFinite(ft2)) return '–';
	return units === 'metric' ? `${one.format(ft2 * M2_PER_FT2)} m²` : `${whole.format(ft2)} ft²`;
}

export function formatLength(ft: number, units: UnitSystem): string {
	if (!Number.isFinite(ft)) return '–';
	return units === 'metric' ? `${one.format(ft * M_PER_FT)} m` : `${one.format(ft)} ft`;
}

/** Squares (100 ft² of roof surface) are the trade's unit in either system. */
export function formatSquares(squares: number): string {
	return Number.isFinite(squares) ? two.format(squares) : '–';
}

export function formatPitch(rise: number): string {
	return `${Number.isInteger(rise) ? rise : one.format(rise)}/12`;
}

export function formatCents(cents: number): string {
	return new Intl.NumberFormat('en-US', {
		style: 'currency',
		currency: 'USD',
		maximumFractionDigits: 0
	}).format(Math.round(cents / 100));
}
