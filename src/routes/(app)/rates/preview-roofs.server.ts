import { facetsOf, house } from '../../../../geodata/scene';
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
		const facets: FacetInput[] = facetsOf(id).map(({ properties: p, geometry }) => ({
			id: p.facetId,
			label: p.label,
			polygon: geometry,
			pitch: p.pitch,
			material: p.material,
			growth: p.growth,
			access: p.access,
			stories: Math.min(3, Math.max(1, p.stories)) as 1 | 2 | 3,
			edges: p.edges
		}));
		out.push({
			houseId: id,
			address: h.properties.address,
			roofType: h.properties.roofType,
			input: { facets, siteFlags: { noGutters: h.properties.noGutters } }
		});
	}
	return out;
}
