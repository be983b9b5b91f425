import { accessRefusal, materialName, OSHA_STEEP_ROOF_RISE } from './access';
import { buildBatches, waterForSite } from './chemistry';
import { EstimateInputError, type EstimateIssue } from './errors';
import { facetFigures, storyRate, type FacetFigures } from './facet';
import { measureFacetPlan, type FacetPlan } from './geometry';
import { EXPECTATIONS } from './growth';
import { jobLabour } from './labour';
import { fixed2, formatCents, shortNumber } from './money';
import { facetName, facetNames, NoteCollector } from './notes';
import { jobCost, jobPrice, marginPct } from './pricing';
import { DWELL_CAP_MINUTES, type RateCard } from './rate-card';
import {
	ACCESS_GRADES,
	GROWTH_GRADES,
	MATERIALS,
	MAX_PITCH_RISE,
	isAccessGrade,
	isGrowthGrade,
	isMaterial,
	type AccessGrade,
	type EstimateInput,
	type Material,
	type EstimateResult,
	type FacetInput,
	type FacetResult,
	type LineItem
} from './types';
import { ft2ToSquares } from './units';

export * from './types';
export * from './errors';
export { DEFAULT_RATE_CARD, cloneRateCard } from './rate-card';
export type { RateCard } from './rate-card';
export { pitchMultiplier } from './pitch';
export { NOT_WALKABLE } from './access';

/** Above this the "stock" is unlikely to be sodium hypochlorite as sold (10–14% is usual). */
const STRONGEST_USUAL_STOCK_PCT = 15;

export type EstimateOutcome =
	{ ok: true; value: EstimateResult } | { ok: false; issues: EstimateIssue[] };

/**
 * Prices a roof plan with a rate card. Pure and deterministic.
 * @throws EstimateInputError with every problem found (answer 400, one entry per issue path)
 */
export function estimate(input: EstimateInput, rateCard: RateCard): EstimateResult {
	const r = tryEstimate(input, rateCard);
	if (!r.ok) throw new EstimateInputError(r.issues);
	return r.value;
}

const isStories = (v: unknown): boolean => v === 1 || v === 2 || v === 3;

const isFiniteIn = (v: unknown, lo: number, hi: number): v is number =>
	typeof v === 'number' && Number.isFinite(v) && v >= lo && v <= hi;

/** Same as estimate() but returns the issues instead of throwing. */
export function tryEstimate(input: EstimateInput, card: RateCard): EstimateOutcome {
	const issues: EstimateIssue[] = [];
	const issue = issueSink(issues);

	const facetsIn: FacetInput[] = Array.isArray(input?.facets) ? input.facets : [];
	if (facetsIn.length === 0) issue(['facets'], 'no_facets', 'facets must list at least one facet');

	const plans: Array<FacetPlan | null> = new Array(facetsIn.length);
	const seenIds = new Set<string>();
	for (let i = 0; i < facetsIn.length; i++) {
		plans[i] = checkFacet(facetsIn[i], i, seenIds, issue);
	}

	const spot = input.testSpot;
	if (spot !== undefined) {
		if (!isFiniteIn(spot.strengthPct, 0, 100) || spot.strengthPct <= 0) {
			issue(
				['testSpot', 'strengthPct'],
				'invalid',
				'testSpot.strengthPct must be a percentage above 0'
			);
		}
		if (!isFiniteIn(spot.secondsToColourChange, 0, Infinity)) {
			issue(
				['testSpot', 'secondsToColourChange'],
				'invalid',
				'testSpot.secondsToColourChange must be a number of seconds, 0 or more'
			);
		}
		spot.facetIds?.forEach((id, k) => {
			if (!seenIds.has(id)) {
				issue(
					['testSpot', 'facetIds', k],
					'unknown_facet',
					`testSpot.facetIds names unknown facet "${id}"`
				);
			}
		});
	}
	const stockFromInput = input.stockStrengthPct !== undefined;
	const stockStrengthPct = stockFromInput
		? input.stockStrengthPct!
		: card.chemistry.stockStrengthPct;
	const stockPath = stockFromInput
		? ['stockStrengthPct']
		: ['rateCard', 'chemistry', 'stockStrengthPct'];
	if (!isFiniteIn(stockStrengthPct, 0, 100) || stockStrengthPct <= 0) {
		issue(
			stockPath,
			'invalid',
			'stockStrengthPct must be the tested stock strength, above 0 and at most 100'
		);
	}
	const discountRequested = input.discountPct ?? 0;
	if (!isFiniteIn(discountRequested, 0, 100)) {
		issue(['discountPct'], 'invalid', 'discountPct must be between 0 and 100');
	}
	const extras = input.extras ?? [];
	extras.forEach((e, k) => {
		if (!Number.isSafeInteger(e?.priceCents) || e.priceCents < 0) {
			issue(
				['extras', k, 'priceCents'],
				'invalid',
				'extras priceCents must be whole cents, 0 or more'
			);
		}
	});
	if (issues.length > 0) return { ok: false, issues };

	const names = facetNames(facetsIn);
	const warnings = new NoteCollector(names);
	const expectations = new NoteCollector(names);
	const spotFacets = spot?.facetIds ? new Set(spot.facetIds) : null;
	const details = new FacetDetailText(card);

	const facets: FacetResult[] = new Array(facetsIn.length);
	const facetLines: LineItem[] = new Array(facetsIn.length);
	let planAreaFt2 = 0;
	let slopedAreaFt2 = 0;
	let eaveLengthFt = 0;
	let perimeterFt = 0;
	let appHours = 0;
	let placements = 0;
	let anySteep = false;
	let anyOshaSteep = false;
	let anyLift = false;
	let anyLadder = false;

	for (let i = 0; i < facetsIn.length; i++) {
		const f = facetsIn[i];
		const plan = plans[i]!;
		const fig = facetFigures(
			f,
			plan,
			card,
			spot && (!spotFacets || spotFacets.has(f.id)) ? spot : undefined
		);
		const r = fig.result;
		facets[i] = r;
		facetLines[i] = facetLine(f, i, r, details);

		planAreaFt2 += r.planAreaFt2;
		slopedAreaFt2 += r.slopedAreaFt2;
		eaveLengthFt += r.eaveLengthFt;
		perimeterFt += r.perimeterFt;
		appHours += fig.applicationHours;
		placements += r.ladderPlacements;
		anySteep ||= r.steep;
		anyOshaSteep ||= f.pitch > OSHA_STEEP_ROOF_RISE;
		anyLift ||= f.access === 'lift';
		anyLadder ||= f.access === 'ladder';

		collectFacetNotes(f, i, fig, warnings, expectations);
	}

	const chem = card.chemistry;
	const { batches, problems } = buildBatches(facets, stockStrengthPct, chem);
	if (problems.length > 0) {
		return {
			ok: false,
			issues: problems.map((p) => ({
				path: stockPath,
				code: 'stock_too_weak',
				message: `${p.message} (${p.facetIds.map((id) => names.get(id) ?? id).join(', ')})`
			}))
		};
	}
	if (stockStrengthPct > STRONGEST_USUAL_STOCK_PCT) {
		warnings.add(
			'chemistry.stock_unusual',
			`stock at ${stockStrengthPct}% is stronger than sodium hypochlorite is usually sold (10–14%); re-test it before mixing`,
			undefined,
			stockPath.join('.')
		);
	}
	let totalMixGal = 0;
	let totalStockGal = 0;
	let totalSurfactantOz = 0;
	for (const b of batches) {
		totalMixGal += b.mixGal;
		totalStockGal += b.stockGal;
		totalSurfactantOz += b.surfactantOz;
	}
	const flags = input.siteFlags ?? {};
	const water = waterForSite(eaveLengthFt, chem, flags.noGutters === true);
	collectJobNotes(flags, anyOshaSteep, anyLadder, warnings);

	const squares = ft2ToSquares(slopedAreaFt2);
	const labour = jobLabour(
		{
			applicationHours: appHours,
			ladderPlacements: placements,
			totalSquares: squares,
			anySteep,
			facetCount: facets.length
		},
		card
	);
	const price = jobPrice(
		{
			facetLines,
			slopedAreaFt2,
			anyLift,
			extras,
			discountPct: discountRequested,
			measuredOnSite: input.measuredOnSite === true
		},
		card,
		warnings
	);
	const cost = jobCost(
		{
			totalStockGal,
			totalSurfactantOz,
			stockStrengthPct,
			labourCents: labour.costCents,
			preTaxCents: price.preTaxCents
		},
		card
	);

	return {
		ok: true,
		value: {
			facets,
			totals: { planAreaFt2, slopedAreaFt2, squares, eaveLengthFt, perimeterFt },
			chemistry: {
				batches,
				stockStrengthPct,
				wastePct: chem.wastePct,
				preWetGal: water.preWetGal,
				rinseGal: water.rinseGal,
				totalMixGal,
				totalStockGal,
				totalSurfactantOz,
				dwellMinutes: Math.min(chem.dwellMinutes, DWELL_CAP_MINUTES)
			},
			labour,
			price,
			cost,
			marginPct: marginPct(price.preTaxCents, cost.totalCents),
			expectations: expectations.list(),
			warnings: warnings.list()
		}
	};
}

/**
 * The parts of a facet's price detail that depend only on the card, built at most once per
 * estimate: turning numbers into text is the slowest step in pricing a facet. Arrays indexed by
 * grade keep the lookups cheap.
 */
class FacetDetailText {
	// One slot per material, grade, access grade and storey count.
	private readonly parts: Array<string | undefined> = new Array(6 + 5 + 4 + 4).fill(undefined);
	private steepText: string | undefined;
	constructor(private readonly card: RateCard) {}

	/** "13.42 sq × $32.00/sq (asphalt shingle) × 1.15 (G2) × 1.3 (ladder) × 1 (1 storey)…" */
	text(f: FacetInput, squares: number, steep: boolean): string {
		const c = this.card;
		const p = this.parts;
		const mi = materialIndex(f.material);
		const gi = 6 + f.growth.charCodeAt(1) - 48;
		const ai = 11 + accessIndex(f.access);
		const si = 15 + f.stories;
		const n = f.stories;
		const text =
			fixed2(squares) +
			(p[mi] ??=
				` sq × ${formatCents(c.materials[f.material].perSquareCents)}/sq (${materialName(f.material)})`) +
			(p[gi] ??= ` × ${shortNumber(c.growth[f.growth].priceMultiplier)} (${f.growth})`) +
			(p[ai] ??= ` × ${shortNumber(c.access[f.access].priceMultiplier)} (${f.access})`) +
			(p[si] ??=
				` × ${shortNumber(storyRate(c, n).priceMultiplier)} (${n} ${n === 1 ? 'storey' : 'storeys'})`);
		if (!steep) return text;
		this.steepText ??= ` × ${shortNumber(c.steepPitch.priceMultiplier)} (steep `;
		return `${text}${this.steepText}${shortNumber(f.pitch)}/12)`;
	}
}

const accessIndex = (a: AccessGrade): number =>
	a === 'ground' ? 0 : a === 'ladder' ? 1 : a === 'roof' ? 2 : 3;

function materialIndex(m: Material): number {
	switch (m) {
		case 'asphalt_shingle':
			return 0;
		case 'clay_tile':
			return 1;
		case 'concrete_tile':
			return 2;
		case 'metal':
			return 3;
		case 'slate':
			return 4;
		default:
			return 5;
	}
}

type IssueSink = (path: EstimateIssue['path'], code: string, message: string) => void;

function issueSink(issues: EstimateIssue[]): IssueSink {
	return (path, code, message) => {
		issues.push({ path, code, message });
	};
}

function facetPath(i: number, ...rest: Array<string | number>): Array<string | number> {
	return ['facets', i, ...rest];
}

function checkFacet(
	f: FacetInput,
	i: number,
	seenIds: Set<string>,
	issue: IssueSink
): FacetPlan | null {
	if (!f || typeof f !== 'object') {
		issue(facetPath(i), 'invalid', 'facet must be an object');
		return null;
	}
	if (typeof f.id !== 'string' || f.id.length === 0) {
		issue(facetPath(i, 'id'), 'invalid', 'facet id must be a non-empty string');
	} else if (seenIds.has(f.id)) {
		issue(facetPath(i, 'id'), 'duplicate_id', `facet id "${f.id}" is used twice`);
	} else {
		seenIds.add(f.id);
	}
	if (!isMaterial(f.material)) {
		issue(
			facetPath(i, 'material'),
			'invalid_enum',
			`material must be one of: ${MATERIALS.join(', ')}`
		);
	}
	if (!isGrowthGrade(f.growth)) {
		issue(
			facetPath(i, 'growth'),
			'invalid_enum',
			`growth must be one of: ${GROWTH_GRADES.join(', ')}`
		);
	}
	if (!isAccessGrade(f.access)) {
		issue(
			facetPath(i, 'access'),
			'invalid_enum',
			`access must be one of: ${ACCESS_GRADES.join(', ')}`
		);
	}
	if (!isStories(f.stories)) {
		issue(facetPath(i, 'stories'), 'invalid', 'stories must be 1, 2 or 3');
	}
	if (!isFiniteIn(f.pitch, 0, MAX_PITCH_RISE)) {
		issue(
			facetPath(i, 'pitch'),
			'invalid',
			`pitch must be a rise per 12 between 0 and ${MAX_PITCH_RISE}`
		);
	}
	if (isMaterial(f.material) && isAccessGrade(f.access)) {
		const refusal = accessRefusal(f.material, f.access);
		if (refusal) issue(facetPath(i, 'access'), 'access_refused', refusal);
	}
	const r = measureFacetPlan(f.geometry);
	if (!r.ok) {
		for (const g of r.issues) issue(facetPath(i, ...g.path), g.code, g.message);
		return null;
	}
	if (f.edges !== undefined) {
		const segments = r.plan.segmentLengthsFt.length;
		if (!Array.isArray(f.edges) || f.edges.length !== segments) {
			issue(
				facetPath(i, 'edges'),
				'edges_length',
				`edges must give one label (or null) per outline segment: ${segments} expected`
			);
			return null;
		}
	}
	return r.plan;
}

function facetLine(f: FacetInput, i: number, r: FacetResult, details: FacetDetailText): LineItem {
	return {
		code: 'facet',
		facetId: f.id,
		label: facetName(f, i),
		detail: details.text(f, r.squares, r.steep),
		amountCents: r.priceCents
	};
}

function collectFacetNotes(
	f: FacetInput,
	i: number,
	fig: FacetFigures,
	warnings: NoteCollector,
	expectations: NoteCollector
): void {
	if (fig.result.eaveEstimated) {
		warnings.addForField(
			'eave.estimated',
			'eave length estimated as the longest unlabelled edge; label the eave edges for exact ladder set-ups and water',
			f.id,
			i,
			'edges'
		);
	}
	if (f.growth === 'G3' || f.growth === 'G4')
		expectations.add('growth.lichen', EXPECTATIONS.lichen, f.id);
	if (f.growth === 'G4') expectations.add('growth.severe', EXPECTATIONS.severe, f.id);
	if (f.material === 'clay_tile' || f.material === 'concrete_tile') {
		expectations.add('material.tile_batch', EXPECTATIONS.tileBatch, f.id);
	}
	if (fig.testSpotEffect === 'raised') {
		expectations.add('test_spot.slow', EXPECTATIONS.slowTestSpot, f.id);
		if (fig.testSpotCapped) {
			warnings.add(
				'test_spot.capped',
				"the test spot calls for a stronger mix than the material's maximum on the rate card; strength held at that maximum",
				f.id
			);
		}
	} else if (fig.testSpotEffect === 'lowered') {
		warnings.add(
			'test_spot.lowered',
			'the test spot changed colour quickly and rinsed clean: mix strength lowered one step',
			f.id
		);
	}
	if (f.material === 'wood_shake') {
		warnings.add(
			'material.wood_shake',
			'sodium hypochlorite can damage wood shake fibres: keep to the lowest strength or use another chemistry as its label allows',
			f.id
		);
	}
	if (f.material === 'metal') {
		warnings.add(
			'material.metal',
			'sodium hypochlorite corrodes metal: rinse metal roofs, flashing and gutters thoroughly, and mind the slick surface',
			f.id
		);
	}
}

function collectJobNotes(
	flags: NonNullable<EstimateInput['siteFlags']>,
	anyOshaSteep: boolean,
	anyLadder: boolean,
	warnings: NoteCollector
): void {
	if (flags.noGutters) {
		warnings.add(
			'site.no_gutters',
			'no gutters: runoff falls straight onto beds and ground. Soak plants and lawn before, rinse after, and keep runoff out of storm drains and ponds (extra pre-wet water allowed)',
			undefined,
			'siteFlags.noGutters'
		);
	}
	if (flags.plantsToProtect) {
		warnings.add(
			'site.plants',
			'plants to protect: pre-wet, cover sensitive plants and rinse them after the wash',
			undefined,
			'siteFlags.plantsToProtect'
		);
	}
	if (anyOshaSteep) {
		warnings.add(
			'safety.steep',
			`facets steeper than ${OSHA_STEEP_ROOF_RISE}/12 are steep roofs for fall protection: plan guardrails, nets or personal fall arrest; follow OSHA or the state plan and local codes`
		);
	}
	if (anyLadder) {
		warnings.add(
			'safety.ladder',
			'ladder work: set the foot a quarter of the working length out, extend 3 ft above the landing, and keep 10 ft from overhead power lines'
		);
	}
}
