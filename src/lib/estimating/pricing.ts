import type { RateCard } from './rate-card';
import type { CostResult, Extra, LineItem, PriceResult } from './types';
import { fixed2, formatCents, formatRateCents, pctOf, roundCents, shortNumber } from './money';

export interface WarningSink {
	add(code: string, message: string, facetId?: string, path?: string): void;
}

export interface FacetPriceFactors {
	squares: number;
	perSquareCents: number;
	growthMultiplier: number;
	accessMultiplier: number;
	storyMultiplier: number;
	steepMultiplier: number;
}

/** Squares × per-square rate × growth × access × storey × steep multipliers, to the cent. */
export function facetPriceCents(f: FacetPriceFactors): number {
	return roundCents(
		f.squares *
			f.perSquareCents *
			f.growthMultiplier *
			f.accessMultiplier *
			f.storyMultiplier *
			f.steepMultiplier
	);
}

export interface JobPriceInput {
	facetLines: LineItem[];
	slopedAreaFt2: number;
	anyLift: boolean;
	extras: readonly Extra[];
	discountPct: number;
	measuredOnSite: boolean;
}

/**
 * Order: work lines → subtotal → minimum job adjustment → discount → tax → total.
 * The discount may not take the price under the minimum job charge, so the two never appear
 * together. Every line is rounded once and the total is their sum, so the lines add up to it.
 */
export function jobPrice(job: JobPriceInput, card: RateCard, warnings: WarningSink): PriceResult {
	const lineItems: LineItem[] = job.facetLines.slice();
	for (let i = 0; i < job.extras.length; i++) {
		const e = job.extras[i];
		lineItems.push({ code: 'extra', label: e.label, detail: 'extra', amountCents: e.priceCents });
	}
	if (card.tripChargeCents > 0) {
		lineItems.push({
			code: 'trip',
			label: 'Trip charge',
			detail: 'per job',
			amountCents: card.tripChargeCents
		});
	}
	if (job.anyLift && card.lift.chargeCents > 0) {
		lineItems.push({
			code: 'lift',
			label: 'Lift charge',
			detail: 'per job with a lift-access facet',
			amountCents: card.lift.chargeCents
		});
	}
	const postRinse = roundCents(job.slopedAreaFt2 * card.postRinseCentsPerFt2);
	if (postRinse > 0) {
		lineItems.push({
			code: 'post_rinse',
			label: 'Post-rinse',
			detail: `${fixed2(job.slopedAreaFt2)} ft² × ${formatRateCents(card.postRinseCentsPerFt2)}/ft²`,
			amountCents: postRinse
		});
	}
	let subtotalCents = 0;
	for (const li of lineItems) subtotalCents += li.amountCents;

	let minimumAdjustmentCents = 0;
	if (subtotalCents < card.minimumJobCents) {
		minimumAdjustmentCents = card.minimumJobCents - subtotalCents;
		lineItems.push({
			code: 'minimum_job',
			label: 'Minimum job charge',
			detail: `work comes to ${formatCents(subtotalCents)}; the minimum job is ${formatCents(card.minimumJobCents)}`,
			amountCents: minimumAdjustmentCents
		});
	}

	let discountPct = job.discountPct;
	if (discountPct > card.maxDiscountPct) {
		warnings.add(
			'discount.capped',
			`discount of ${job.discountPct}% is over the owner's cap; ${card.maxDiscountPct}% applied`,
			undefined,
			'discountPct'
		);
		discountPct = card.maxDiscountPct;
	}
	let discountCents = 0;
	if (discountPct > 0) {
		const wanted = pctOf(subtotalCents, discountPct);
		const room = Math.max(0, subtotalCents + minimumAdjustmentCents - card.minimumJobCents);
		discountCents = Math.min(wanted, room);
		if (discountCents < wanted) {
			warnings.add(
				'discount.minimum',
				`discount reduced to ${formatCents(discountCents)} so the price stays at the minimum job charge of ${formatCents(card.minimumJobCents)}`,
				undefined,
				'discountPct'
			);
		}
		if (discountCents > 0) {
			lineItems.push({
				code: 'discount',
				label: 'Discount',
				detail:
					discountCents === wanted
						? `${discountPct}% of ${formatCents(subtotalCents)}`
						: `${discountPct}% of ${formatCents(subtotalCents)}, held to the minimum job charge`,
				amountCents: -discountCents
			});
		}
	}
	const preTaxCents = subtotalCents + minimumAdjustmentCents - discountCents;
	const taxCents = pctOf(preTaxCents, card.taxPct);
	if (taxCents !== 0) {
		lineItems.push({
			code: 'tax',
			label: 'Tax',
			detail: `${card.taxPct}% of ${formatCents(preTaxCents)}`,
			amountCents: taxCents
		});
	}
	const totalCents = preTaxCents + taxCents;

	const range = job.measuredOnSite ? card.range.confirmed : card.range.remote;
	// Measurement doubt cannot take the price under the minimum job charge.
	const floor = Math.min(
		totalCents,
		card.minimumJobCents + pctOf(card.minimumJobCents, card.taxPct)
	);
	const lowCents = Math.max(floor, totalCents - pctOf(totalCents, range.lowPct));
	const highCents = totalCents + pctOf(totalCents, range.highPct);
	const depositCents = Math.min(totalCents, pctOf(totalCents, card.depositPct));

	return {
		subtotalCents,
		minimumAdjustmentCents,
		discountCents,
		discountPct,
		preTaxCents,
		taxCents,
		totalCents,
		lowCents,
		highCents,
		depositCents,
		measuredOnSite: job.measuredOnSite,
		lineItems
	};
}

export interface JobCostInput {
	totalStockGal: number;
	totalSurfactantOz: number;
	stockStrengthPct: number;
	labourCents: number;
	preTaxCents: number;
}

/** Cost = chemical + labour + overhead (a share of the pre-tax price). Water is not costed. */
export function jobCost(c: JobCostInput, card: RateCard): CostResult {
	const { stockCentsPerGal, surfactantCentsPerOz } = card.chemistry;
	const stockCents = roundCents(c.totalStockGal * stockCentsPerGal);
	const surfCents = roundCents(c.totalSurfactantOz * surfactantCentsPerOz);
	const overheadCents = pctOf(c.preTaxCents, card.overheadPct);
	const lineItems: LineItem[] = [
		{
			code: 'cost.stock',
			label: 'Sodium hypochlorite stock',
			detail: `${fixed2(c.totalStockGal)} gal × ${formatRateCents(stockCentsPerGal)}/gal (${shortNumber(c.stockStrengthPct)}% stock)`,
			amountCents: stockCents
		},
		{
			code: 'cost.surfactant',
			label: 'Surfactant',
			detail: `${fixed2(c.totalSurfactantOz)} fl oz × ${formatRateCents(surfactantCentsPerOz)}/fl oz`,
			amountCents: surfCents
		},
		{
			code: 'cost.labour',
			label: 'Labour',
			detail: 'see labour line items',
			amountCents: c.labourCents
		},
		{
			code: 'cost.overhead',
			label: 'Overhead',
			detail: `${card.overheadPct}% of ${formatCents(c.preTaxCents)} pre-tax price`,
			amountCents: overheadCents
		}
	];
	const chemicalCents = stockCents + surfCents;
	return {
		chemicalCents,
		labourCents: c.labourCents,
		overheadCents,
		totalCents: chemicalCents + c.labourCents + overheadCents,
		lineItems
	};
}

export function marginPct(preTaxCents: number, costCents: number): number {
	return preTaxCents === 0 ? 0 : ((preTaxCents - costCents) / preTaxCents) * 100;
}
