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

export function sumCents(items: ReadonlyArray<{ amountCents: number }>): number {
	let s = 0;
	for (const it of items) s += it.amountCents;
	return s;
}

/** "$1,234.56" / "−$5.00": for line-item details only, never for arithmetic. */
export function formatCents(cents: number): string {
	const neg = cents < 0;
	const abs = Math.abs(cents);
	const dollars = Math.floor(abs / 100);
	const rest = abs - dollars * 100;
	const d = String(dollars).replace(/\B(?=(\d{3})+(?!\d))/g, ',');
	return `${neg ? '−' : ''}$${d}.${rest < 10 ? '0' : ''}${rest}`;
}

/** A rate that may carry fractions of a cent (e.g. 4.5¢/ft²). */
export function formatRateCents(cents: number): string {
	return Number.isInteger(cents) ? formatCents(cents) : `${cents}¢`;
}
