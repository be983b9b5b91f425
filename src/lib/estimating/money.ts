/**
 * Money is integer cents. Every line item is rounded once, to the nearest cent with halves away
 * from zero; totals are sums of rounded line items, so they always add up to the cent.
 */

/** Nearest cent, halves away from zero; the epsilon absorbs float noise like 0.145 * 100. */
export function roundCents(x: number): number {
	if (!Number.isFinite(x)) throw new RangeError(`cannot round ${x} to cents`);
	const r = Math.sign(x) * Math.round(Math.abs(x) * (1 + Number.EPSILON));
	return r === 0 ? 0 : r;
}

/** pct of an amount in cents, rounded once. */
export const pctOf = (cents: number, pct: number): number => roundCents((cents * pct) / 100);

/** "$1,234.56" / "−$5.00": for line-item details only, never for arithmetic. */
export function formatCents(cents: number): string {
	const neg = cents < 0;
	const abs = Math.abs(cents);
	const dollars = Math.floor(abs / 100);
	const rest = abs - dollars * 100;
	let d = String(dollars);
	for (let k = d.length - 3; k > 0; k -= 3) d = d.slice(0, k) + ',' + d.slice(k);
	return `${neg ? '−' : ''}$${d}.${rest < 10 ? '0' : ''}${rest}`;
}

/** A rate that may carry fractions of a cent (e.g. 4.5¢/ft²). */
export function formatRateCents(cents: number): string {
	return Number.isInteger(cents) ? formatCents(cents) : `${cents}¢`;
}

/** x.toFixed(2) for display, several times faster (halves round up; display only). */
export function fixed2(x: number): string {
	const r = Math.round(Math.abs(x) * 100);
	const i = Math.floor(r / 100);
	const f = r - i * 100;
	return `${x < 0 && r !== 0 ? '-' : ''}${i}.${f < 10 ? '0' : ''}${f}`;
}

/**
 * A figure for display with at most three decimals and no trailing zeros (7, 7.5, 1.125).
 * Integer arithmetic, because number-to-text of a fraction is slow in the hot path.
 */
export function shortNumber(x: number): string {
	if (Number.isInteger(x)) return `${x}`;
	const r = Math.round(Math.abs(x) * 1000);
	const i = Math.floor(r / 1000);
	let f = r - i * 1000;
	const sign = x < 0 && r !== 0 ? '-' : '';
	if (f === 0) return `${sign}${i}`;
	let digits = 3;
	while (f % 10 === 0) {
		f /= 10;
		digits--;
	}
	return `${sign}${i}.${String(f).padStart(digits, '0')}`;
}
