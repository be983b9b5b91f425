import { estimateFacetsOf, house } from '../../../../geodata/scene';
import type { EstimateInput, FacetInput } from '$lib/estimating/types';

export interface PreviewRoof {
	houseId: string;
	address: string;
	roofType: string;
	input: EstimateInput;
}

/** Three sample-scene houses that between them use most of the card: shingle, tile, slate. */
const PREVIEW_HOUSES = ['h03', 'h04', 'h07'];

/** Roof plans of the preview houses as the model takes them (their facets are the scene's truth). */
export function previewRoofs(): PreviewRoof[] {
	const out: PreviewRoof[] = [];
	for (const id of PREVIEW_HOUSES) {
		const h = house(id);
		if (!h) continue;
		const facets: FacetInput[] = estimateFacetsOf(id);
		out.push({
			houseId: id,
			address: h.properties.address,
			roofType: h.properties.roofType,
			input: { facets, siteFlags: { noGutters: h.properties.noGutters } }
		});
	}
	return out;
}
