import { pctOf } from '../estimating/money';
import type { OfferedExtra, TickedExtra } from './types';

export type AcceptedPrice = {
	extras: TickedExtra[];
	extrasCents: number;
	extrasTaxCents: number;
	totalCents: number;
	depositCents: number;
};

/**
 * The price of a proposal with the extras the customer ticked, as the estimating model prices
 * its own lines: each extra is a pre-tax line, tax is the rate card's percentage of them, and the
 * deposit is the card's percentage of the new total (never more than the total). Codes that are
 * not offered are ignored, and a price sent from the browser is never read: only codes count.
 * The customer's page runs this for the live figure; the server runs it again on acceptance.
 */
export function priceWithExtras(
	offer: {
		totalCents: number;
		depositPct: number;
		taxPct: number;
		extras: readonly OfferedExtra[];
	},
	tickedCodes: Iterable<string>
): AcceptedPrice {
	const wanted = new Set(tickedCodes);
	const extras = offer.extras
		.filter((e) => wanted.has(e.code))
		.map((e) => ({ code: e.code, label: e.label, priceCents: e.priceCents }));
	const extrasCents = extras.reduce((n, e) => n + e.priceCents, 0);
	const extrasTaxCents = pctOf(extrasCents, offer.taxPct);
	const totalCents = offer.totalCents + extrasCents + extrasTaxCents;
	const depositCents = Math.min(totalCents, pctOf(totalCents, offer.depositPct));
	return { extras, extrasCents, extrasTaxCents, totalCents, depositCents };
}
