import { describe, expect, it } from 'vitest';
import {
	cloneRateCard,
	DEFAULT_RATE_CARD,
	estimate,
	type EstimateInput,
	type RateCard
} from '../../../src/lib/estimating';
import { formatCents, roundCents } from '../../../src/lib/estimating/money';
import { facet, gableRoof, localPlane, WRENFIELD } from './fixtures';

const plane = localPlane(WRENFIELD.lat, WRENFIELD.lon);
const sum = (xs: Array<{ amountCents: number }>) => xs.reduce((s, x) => s + x.amountCents, 0);

/**
 * Worked roof W1 (docs/estimating-model.md §13): 40 × 30 ft plan at 6/12, shingle, G1, ground,
 * one storey.
 */
const worked = (): EstimateInput => ({
	facets: [
		facet({
			id: 'main',
			geometry: plane.rectFt(40, 30),
			pitch: 6,
			edges: ['eave', 'rake', 'eave', 'rake']
		})
	]
});

describe('worked estimate, by hand from the default card', () => {
	const r = estimate(worked(), DEFAULT_RATE_CARD);
	// docs/estimating-model.md §13 W1 (JLC slope factor): 13.42 squares
	const squares = (1200 * Math.sqrt(1.25)) / 100;

	it('prices squares × $32 and post-rinse at 4¢/ft²', () => {
		expect(r.facets[0].priceCents).toBe(Math.round(squares * 3200));
		const rinse = r.price.lineItems.find((l) => l.code === 'post_rinse')!;
		expect(rinse.amountCents).toBe(Math.round(squares * 100 * 4));
		expect(r.price.totalCents).toBe(Math.round(squares * 3200) + Math.round(squares * 400));
		expect(r.price.totalCents).toBe(42933 + 5367);
	});

	it('deposit 25%, range −10%/+15% while remote, −3%/+5% once measured on site', () => {
		const t = r.price.totalCents;
		expect(r.price.depositCents).toBe(Math.round(t * 0.25));
		expect(r.price.lowCents).toBe(t - Math.round(t * 0.1));
		expect(r.price.highCents).toBe(t + Math.round(t * 0.15));
		const onSite = estimate({ ...worked(), measuredOnSite: true }, DEFAULT_RATE_CARD).price;
		expect(onSite.totalCents).toBe(t);
		expect(onSite.lowCents).toBe(t - Math.round(t * 0.03));
		expect(onSite.highCents).toBe(t + Math.round(t * 0.05));
	});

	it('labour: 1 h set-up + squares ÷ 14/h + 1 min/square rinse, crew of 2 at $38/h', () => {
		const hours = 1 + squares / 14 + squares / 60;
		expect(r.labour.hours).toBeCloseTo(hours, 6);
		expect(r.labour.crewSize).toBe(2);
		expect(r.labour.technicianHours).toBeCloseTo(hours * 2, 6);
		expect(r.labour.costCents).toBe(
			7600 + Math.round((squares / 14) * 7600) + Math.round((squares / 60) * 7600)
		);
		expect(sum(r.labour.lineItems)).toBe(r.labour.costCents);
		expect(r.labour.lineItems.reduce((s, l) => s + l.hours, 0)).toBeCloseTo(r.labour.hours, 12);
	});

	it('cost: stock at 3% from 12.5% with 10% waste, surfactant 1 oz/gal, overhead 12%', () => {
		const mix = squares * 1.5 * 1.1;
		expect(r.chemistry.batches).toHaveLength(1);
		expect(r.chemistry.batches[0].strengthPct).toBe(3);
		expect(r.chemistry.batches[0].stockGal).toBeCloseTo((mix * 3) / 12.5, 6);
		expect(r.cost.chemicalCents).toBe(Math.round(((mix * 3) / 12.5) * 500) + Math.round(mix * 30));
		expect(r.cost.overheadCents).toBe(Math.round(r.price.totalCents * 0.12));
		expect(r.cost.totalCents).toBe(
			r.cost.chemicalCents + r.cost.labourCents + r.cost.overheadCents
		);
		expect(sum(r.cost.lineItems)).toBe(r.cost.totalCents);
		expect(r.marginPct).toBeCloseTo(
			((r.price.preTaxCents - r.cost.totalCents) / r.price.preTaxCents) * 100,
			10
		);
	});

	it('explains every price figure with a line item adding up to the total', () => {
		expect(sum(r.price.lineItems)).toBe(r.price.totalCents);
		for (const li of r.price.lineItems) {
			expect(li.label.length).toBeGreaterThan(0);
			expect(li.detail.length).toBeGreaterThan(0);
		}
		expect(r.price.lineItems[0].detail).toContain('13.42 sq × $32.00/sq');
	});
});

describe('minimum job, discount, tax, extras, steep pitch', () => {
	const small = (): EstimateInput => ({
		facets: [facet({ geometry: plane.rectFt(12, 10), pitch: 4 })]
	});

	it('a small job is raised to the minimum job charge with its own line', () => {
		const r = estimate(small(), DEFAULT_RATE_CARD).price;
		expect(r.subtotalCents).toBeLessThan(39500);
		expect(r.totalCents).toBe(39500);
		const min = r.lineItems.find((l) => l.code === 'minimum_job')!;
		expect(min.amountCents).toBe(39500 - r.subtotalCents);
		expect(sum(r.lineItems)).toBe(39500);
		expect(r.lowCents).toBe(39500); // measurement doubt cannot go under the minimum
	});

	it('discount is capped by the owner and never takes the price under the minimum', () => {
		const big = (): EstimateInput => ({
			facets: gableRoof().map((f) => ({ ...f, growth: 'G4' as const }))
		});
		const plain = estimate(big(), DEFAULT_RATE_CARD).price;
		const ten = estimate({ ...big(), discountPct: 10 }, DEFAULT_RATE_CARD);
		expect(ten.price.discountCents).toBe(Math.round(plain.subtotalCents * 0.1));
		expect(ten.price.totalCents).toBe(plain.totalCents - ten.price.discountCents);
		expect(sum(ten.price.lineItems)).toBe(ten.price.totalCents);

		const greedy = estimate({ ...big(), discountPct: 40 }, DEFAULT_RATE_CARD);
		expect(greedy.price.discountPct).toBe(15);
		expect(greedy.price.discountCents).toBe(Math.round(plain.subtotalCents * 0.15));
		expect(greedy.warnings.find((w) => w.code === 'discount.capped')?.path).toBe('discountPct');

		const smallDisc = estimate({ ...small(), discountPct: 10 }, DEFAULT_RATE_CARD);
		expect(smallDisc.price.totalCents).toBe(39500);
		expect(smallDisc.price.discountCents).toBe(0);
		expect(smallDisc.warnings.map((w) => w.code)).toContain('discount.minimum');
	});

	it('tax applies to the pre-tax price; deposit is on the total', () => {
		const card = cloneRateCard();
		card.taxPct = 8.25;
		const r = estimate(worked(), card).price;
		expect(r.taxCents).toBe(roundCents(r.preTaxCents * 0.0825));
		expect(r.totalCents).toBe(r.preTaxCents + r.taxCents);
		expect(r.depositCents).toBe(Math.round(r.totalCents * 0.25));
		expect(sum(r.lineItems)).toBe(r.totalCents);
	});

	it('extras and the trip charge are added as their own lines', () => {
		const card = cloneRateCard();
		card.tripChargeCents = 4500;
		const r = estimate(
			{ ...worked(), extras: [{ label: 'Gutter flush', priceCents: 12000 }] },
			card
		).price;
		const base = estimate(worked(), DEFAULT_RATE_CARD).price;
		expect(r.totalCents).toBe(base.totalCents + 12000 + 4500);
		expect(r.lineItems.find((l) => l.code === 'extra')?.label).toBe('Gutter flush');
		expect(r.lineItems.find((l) => l.code === 'trip')?.amountCents).toBe(4500);
	});

	it('steep pitch over 8/12 multiplies the facet price by 1.2 and adds set-up time', () => {
		const at = (pitch: number) =>
			estimate({ facets: [facet({ geometry: plane.rectFt(40, 30), pitch })] }, DEFAULT_RATE_CARD);
		const eight = at(8);
		const nine = at(9);
		expect(eight.facets[0].steep).toBe(false);
		expect(nine.facets[0].steep).toBe(true);
		expect(nine.facets[0].priceCents).toBe(Math.round(nine.facets[0].squares * 3200 * 1.2));
		expect(nine.labour.lineItems.some((l) => l.code === 'labour.steep_setup')).toBe(true);
		expect(eight.labour.lineItems.some((l) => l.code === 'labour.steep_setup')).toBe(false);
		// OSHA steep roof > 4/12 (29 CFR 1926.500(b)) → fall-protection caution
		expect(eight.warnings.map((w) => w.code)).toContain('safety.steep');
		expect(at(4).warnings.map((w) => w.code)).not.toContain('safety.steep');
	});

	it('growth price multipliers G0 ×0.8 … G4 ×1.6', () => {
		// demo defaults, from memory (docs/estimating-model.md §12)
		const mult = { G0: 0.8, G1: 1.0, G2: 1.15, G3: 1.35, G4: 1.6 } as const;
		for (const [g, m] of Object.entries(mult)) {
			const r = estimate(
				{ facets: [facet({ geometry: plane.rectFt(40, 30), growth: g as keyof typeof mult })] },
				DEFAULT_RATE_CARD
			);
			expect(r.facets[0].priceCents).toBe(Math.round(r.facets[0].squares * 3200 * m));
		}
	});
});

describe('rate-card driven: every figure comes from the card', () => {
	const price = (card: RateCard, input = worked()) => estimate(input, card);

	it('changing a per-square rate moves the facet price in proportion', () => {
		const card = cloneRateCard();
		card.materials.asphalt_shingle.perSquareCents = 6400;
		const a = price(DEFAULT_RATE_CARD).facets[0].priceCents;
		const b = price(card).facets[0].priceCents;
		expect(Math.abs(b - 2 * a)).toBeLessThanOrEqual(1);
		expect(DEFAULT_RATE_CARD.materials.asphalt_shingle.perSquareCents).toBe(3200); // copy, not the default
	});

	it('minimum job, deposit, range, overhead, labour rate and chemical prices all follow the card', () => {
		const card = cloneRateCard();
		card.minimumJobCents = 100000;
		card.depositPct = 50;
		card.range.remote = { lowPct: 20, highPct: 30 };
		card.overheadPct = 20;
		card.labour.centsPerTechnicianHour = 5000;
		card.labour.crewSize = 3;
		card.chemistry.stockCentsPerGal = 1000;
		const r = price(card);
		const base = price(DEFAULT_RATE_CARD);
		expect(r.price.totalCents).toBe(100000);
		expect(r.price.depositCents).toBe(50000);
		expect(r.price.lowCents).toBe(100000); // floored at the minimum
		expect(r.price.highCents).toBe(130000);
		expect(r.cost.overheadCents).toBe(20000);
		expect(r.labour.hours).toBeCloseTo(base.labour.hours, 12);
		expect(r.labour.costCents / base.labour.costCents).toBeCloseTo((5000 * 3) / (3800 * 2), 3);
		const stock = (x: typeof r) =>
			x.cost.lineItems.find((l) => l.code === 'cost.stock')!.amountCents;
		expect(Math.abs(stock(r) - 2 * stock(base))).toBeLessThanOrEqual(1);
	});

	it('doubling every money figure on the card doubles every price line (to the cent)', () => {
		const card = cloneRateCard();
		for (const m of Object.values(card.materials)) m.perSquareCents *= 2;
		card.postRinseCentsPerFt2 *= 2;
		card.minimumJobCents *= 2;
		const input: EstimateInput = {
			facets: gableRoof().map((f, i) => ({
				...f,
				material: i ? 'slate' : 'metal',
				access: 'ladder'
			}))
		};
		const a = price(DEFAULT_RATE_CARD, input).price;
		const b = price(card, input).price;
		expect(b.lineItems.map((l) => l.code)).toEqual(a.lineItems.map((l) => l.code));
		b.lineItems.forEach((l, i) =>
			expect(Math.abs(l.amountCents - 2 * a.lineItems[i].amountCents)).toBeLessThanOrEqual(1)
		);
	});

	it('a production rate and a coverage change move labour and chemistry', () => {
		const card = cloneRateCard();
		card.materials.asphalt_shingle.productionSquaresPerHour = 7;
		card.materials.asphalt_shingle.coverageGalPerSquare = 3;
		const a = price(DEFAULT_RATE_CARD);
		const b = price(card);
		const app = (r: typeof a) =>
			r.labour.lineItems.find((l) => l.code === 'labour.application')!.hours;
		expect(app(b) / app(a)).toBeCloseTo(2, 12);
		expect(b.chemistry.totalMixGal / a.chemistry.totalMixGal).toBeCloseTo(2, 12);
	});
});

describe('money helpers', () => {
	it('rounds halves away from zero despite float noise and formats for details', () => {
		expect(roundCents(0.5)).toBe(1);
		expect(roundCents(-0.5)).toBe(-1);
		expect(roundCents(1.005 * 100)).toBe(101); // 100.49999999999999 in floating point
		expect(roundCents(-0)).toBe(0);
		expect(formatCents(123456)).toBe('$1,234.56');
		expect(formatCents(-505)).toBe('−$5.05');
		expect(formatCents(7)).toBe('$0.07');
	});
});

describe('display helpers', () => {
	it('shortNumber keeps up to three decimals without trailing zeros', async () => {
		const { shortNumber, fixed2 } = await import('../../../src/lib/estimating/money');
		expect([7, 7.5, 1.15, 1.125, 0.05, 10.25, -2.5, 3.0004].map(shortNumber)).toEqual([
			'7',
			'7.5',
			'1.15',
			'1.125',
			'0.05',
			'10.25',
			'-2.5',
			'3'
		]);
		expect([0, 13.416, 2.005, 100.999].map(fixed2)).toEqual(['0.00', '13.42', '2.01', '101.00']);
	});
});
