import { createHash } from 'node:crypto';
import { facetName } from '../../estimating/notes';
import type { EstimateResult, FacetResult, Note } from '../../estimating/types';
import type { ProposalSnapshot, ScopeLine } from '../../proposal/types';
import { offeredExtras } from './offers';

const MATERIAL: Record<FacetResult['material'], string> = {
	asphalt_shingle: 'asphalt shingle',
	clay_tile: 'clay tile',
	concrete_tile: 'concrete tile',
	metal: 'metal',
	slate: 'slate',
	wood_shake: 'wood shake'
};

const GROWTH: Record<FacetResult['growth'], string> = {
	G0: 'little growth to remove (G0)',
	G1: 'light algae streaks (G1)',
	G2: 'moderate streaks with spots of lichen (G2)',
	G3: 'heavy growth with lichen colonies (G3)',
	G4: 'severe growth with moss or thick lichen (G4)'
};

const ACCESS: Record<FacetResult['access'], string> = {
	ground: 'worked from the ground',
	ladder: 'worked from ladders',
	roof: 'worked on the roof',
	lift: 'worked from a lift'
};

const squares = (n: number) => (Math.round(n * 10) / 10).toFixed(1);

/** One facet in plain words: what it is, what is on it and how the crew reaches it. */
export function scopeLine(f: FacetResult, index: number): ScopeLine {
	const coats = f.applications === 1 ? 'one application' : `${f.applications} applications`;
	const story = f.stories > 1 ? `, ${f.stories} stories up` : '';
	return {
		facet: facetName(f, index),
		text:
			`${squares(f.squares)} squares of ${MATERIAL[f.material]} at a ${f.pitch}/12 pitch${story}; ` +
			`${GROWTH[f.growth]}. Soft wash, ${coats}, ${ACCESS[f.access]}.`
	};
}

/** A note for the customer, naming the facets it is about by label (never by id). */
export function noteText(n: Note, names: ReadonlyMap<string, string>): string {
	const msg = (n.message.charAt(0).toUpperCase() + n.message.slice(1)).replace(/\.$/, '');
	const facets = (n.facetIds ?? []).map((id) => names.get(id) ?? 'one facet');
	return facets.length ? `${msg} (${facets.join(', ')}).` : `${msg}.`;
}

export function facetNamesOf(r: EstimateResult): Map<string, string> {
	const names = new Map<string, string>();
	r.facets.forEach((f, i) => names.has(f.id) || names.set(f.id, facetName(f, i)));
	return names;
}

/** Which revision of an estimate a proposal is: the hash of its frozen input and result. */
export function estimateDigest(input: unknown, result: unknown): string {
	return createHash('sha256')
		.update(JSON.stringify([input, result]))
		.digest('hex');
}

export type SnapshotSource = {
	result: EstimateResult;
	company: ProposalSnapshot['company'];
	customerName: string;
	siteAddress: string;
	siteFlags: { noGutters?: boolean };
	salesperson: string | null;
	depositPct: number;
	taxPct: number;
	validUntil: string;
	issuedOn: string;
	version: number;
	/** Site-visit photos marked for the customer. */
	photos?: { id: string; fileName: string }[];
};

export function buildSnapshot(s: SnapshotSource): ProposalSnapshot {
	const r = s.result;
	const names = facetNamesOf(r);
	const hasPostRinse = r.price.lineItems.some((l) => l.code === 'post_rinse');
	const included = [
		'Soft wash of every facet listed above at low pressure: the cleaning solution, not water force, does the work.',
		'Watering plants and lawn before and after, and covering the sensitive ones.',
		'Downspouts turned away from storm drains while we work, and drains covered.',
		hasPostRinse
			? 'A clean-water rinse of the roof after the wash.'
			: 'A clean-water rinse where the solution needs it.',
		'Clean-up of the work area before we leave.'
	];
	return {
		company: s.company,
		customerName: s.customerName,
		siteAddress: s.siteAddress,
		salesperson: s.salesperson,
		scope: r.facets.map(scopeLine),
		totals: { squares: r.totals.squares, facets: r.facets.length },
		priceLines: r.price.lineItems.map((l) => ({ label: l.label, amountCents: l.amountCents })),
		totalCents: r.price.totalCents,
		depositCents: r.price.depositCents,
		depositPct: s.depositPct,
		taxPct: s.taxPct,
		included,
		extras: offeredExtras(r, s.siteFlags),
		expectations: r.expectations.map((n) => noteText(n, names)),
		validUntil: s.validUntil,
		issuedOn: s.issuedOn,
		version: s.version,
		photos: (s.photos ?? []).map((p) => ({ id: p.id, caption: p.fileName }))
	};
}
