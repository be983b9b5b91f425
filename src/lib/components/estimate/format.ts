import type { AccessGrade, GrowthGrade, Material } from '$lib/estimating/types';

/** Display only: the model works in integer cents and full-precision areas. */

const usd = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });

export const money = (cents: number) => usd.format(cents / 100);

export function signedMoney(cents: number): string {
	if (cents === 0) return '±$0.00';
	return (cents > 0 ? '+' : '−') + usd.format(Math.abs(cents) / 100);
}

export const num = (x: number, digits = 2) =>
	x.toLocaleString('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits });

export const int = (x: number) => Math.round(x).toLocaleString('en-US');

const dateFmt = new Intl.DateTimeFormat('en-US', { dateStyle: 'medium' });
const dateTimeFmt = new Intl.DateTimeFormat('en-US', { dateStyle: 'medium', timeStyle: 'short' });
export const date = (d: Date | string) => dateFmt.format(new Date(d));
export const dateTime = (d: Date | string) => dateTimeFmt.format(new Date(d));

export const MATERIAL_LABELS: Record<Material, string> = {
	asphalt_shingle: 'Asphalt shingle',
	clay_tile: 'Clay tile',
	concrete_tile: 'Concrete tile',
	metal: 'Metal',
	slate: 'Slate',
	wood_shake: 'Wood shake'
};

export const GROWTH_LABELS: Record<GrowthGrade, string> = {
	G0: 'G0 clean',
	G1: 'G1 light',
	G2: 'G2 moderate',
	G3: 'G3 heavy',
	G4: 'G4 severe'
};

export const ACCESS_LABELS: Record<AccessGrade, string> = {
	ground: 'Ground',
	ladder: 'Ladder',
	roof: 'Roof',
	lift: 'Lift'
};
