import { meridionalRadius, primeVerticalRadius } from '../estimating/geometry';
import type { EstimateInput, FacetInput } from '../estimating/types';

/**
 * Illustrative roofs the Rates page prices with the current and the edited card, so the owner
 * sees what a change does before saving it. They are plain shapes, not anyone's house: each is
 * described by its size, pitch and cover, and none is read from the sample imagery.
 */
export interface PreviewRoof {
	id: string;
	/** The shape in words, e.g. "30 × 40 ft gable at 6/12". */
	name: string;
	/** Cover, growth and access in words. */
	detail: string;
	input: EstimateInput;
}

const DEG = Math.PI / 180;
const M_PER_FT = 0.3048;
/** Any point will do for plain shapes; this one is in the invented town of Wrenfield. */
const ORIGIN = { lat: 35.52, lon: -74.46 };

/** A w × h ft plan rectangle whose south-west corner is x, y ft east and north of ORIGIN. */
function rect(x: number, y: number, w: number, h: number): FacetInput['geometry'] {
	const { lat, lon } = ORIGIN;
	const dLon = (ft: number) => (ft * M_PER_FT) / (primeVerticalRadius(lat) * Math.cos(lat * DEG));
	const dLat = (ft: number) => (ft * M_PER_FT) / meridionalRadius(lat);
	const at = (fx: number, fy: number): [number, number] => [
		lon + dLon(fx) / DEG,
		lat + dLat(fy) / DEG
	];
	const ring = [at(x, y), at(x + w, y), at(x + w, y + h), at(x, y + h)];
	return { type: 'Polygon', coordinates: [[...ring, ring[0]]] };
}

type Slopes = Pick<FacetInput, 'pitch' | 'material' | 'growth' | 'access' | 'stories'>;

/** A gable: two rectangular slopes of `run` ft each side of an east–west ridge `length` ft long. */
function gable(length: number, run: number, s: Slopes): FacetInput[] {
	return [
		{ id: 'south', label: 'South slope', geometry: rect(0, 0, length, run), ...s },
		{ id: 'north', label: 'North slope', geometry: rect(0, run, length, run), ...s }
	].map((f) => ({
		...f,
		// Ring segments run south, east, north, west; the ridge is where the slopes meet.
		edges: f.id === 'south' ? ['eave', 'rake', 'ridge', 'rake'] : ['ridge', 'rake', 'eave', 'rake']
	}));
}

export const PREVIEW_ROOFS: readonly PreviewRoof[] = [
	{
		id: 'gable-shingle',
		name: '30 × 40 ft gable at 6/12',
		detail: 'Asphalt shingle, moderate growth (G2), one storey from a ladder',
		input: {
			facets: gable(40, 15, {
				pitch: 6,
				material: 'asphalt_shingle',
				growth: 'G2',
				access: 'ladder',
				stories: 1
			})
		}
	},
	{
		id: 'gable-tile',
		name: '24 × 36 ft gable at 5/12',
		detail: 'Concrete tile, heavy growth (G3), two storeys from a ladder, no gutters',
		input: {
			facets: gable(36, 12, {
				pitch: 5,
				material: 'concrete_tile',
				growth: 'G3',
				access: 'ladder',
				stories: 2
			}),
			siteFlags: { noGutters: true }
		}
	},
	{
		id: 'gable-slate',
		name: '28 × 32 ft gable at 10/12',
		detail: 'Slate, light growth (G1), two storeys from a lift',
		input: {
			facets: gable(32, 14, {
				pitch: 10,
				material: 'slate',
				growth: 'G1',
				access: 'lift',
				stories: 2
			})
		}
	}
];
