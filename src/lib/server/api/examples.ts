import { DEFAULT_RATE_CARD, estimate } from '../../estimating';
import { meridionalRadius, primeVerticalRadius } from '../../estimating/geometry';
import type { EstimateRequest } from '../../schemas/estimate';

const DEG = Math.PI / 180;
const M_PER_FT = 0.3048;

/** w × h ft rectangle, south-west corner at (lat0, lon0), on the local WGS84 plane there. */
function rectangle(lat0: number, lon0: number, wFt: number, hFt: number): [number, number][] {
	const dLon = (ft: number) => (ft * M_PER_FT) / (primeVerticalRadius(lat0) * Math.cos(lat0 * DEG));
	const dLat = (ft: number) => (ft * M_PER_FT) / meridionalRadius(lat0);
	const round = (v: number) => Math.round(v * 1e9) / 1e9;
	const corners: [number, number][] = [
		[0, 0],
		[wFt, 0],
		[wFt, hFt],
		[0, hFt]
	];
	const ring = corners.map(
		([x, y]) => [round(lon0 + dLon(x) / DEG), round(lat0 + dLat(y) / DEG)] as [number, number]
	);
	return [...ring, ring[0]];
}

/**
 * Worked value W1 of docs/estimating-model.md §13 as an API call: a 40 × 30 ft plan at 6/12 in the invented
 * town of Wrenfield (≈1341.6 ft², 13.42 squares). Priced with the demo rate card.
 */
export const EXAMPLE_REQUEST = {
	facets: [
		{
			id: 'south',
			label: 'South slope',
			geometry: { type: 'Polygon', coordinates: [rectangle(35.5197, -74.4614, 40, 30)] },
			pitch: 6,
			material: 'asphalt_shingle',
			growth: 'G2',
			access: 'ladder',
			stories: 1,
			edges: ['eave', 'rake', 'ridge', 'rake']
		}
	],
	stockStrengthPct: 12.5,
	siteFlags: { plantsToProtect: true }
} satisfies EstimateRequest;

let exampleResult: ReturnType<typeof estimate> | undefined;

/** The model's answer to EXAMPLE_REQUEST with the demo defaults (computed, not typed in). */
export function exampleResponse() {
	exampleResult ??= estimate(EXAMPLE_REQUEST, DEFAULT_RATE_CARD);
	return {
		...exampleResult,
		rateCard: { id: '5b0f7a3e-2c1d-4e8f-9a6b-1d2c3e4f5a6b', version: 1 }
	};
}

export const EXAMPLE_ERROR = {
	message: 'The request has 2 problems: facets.0.pitch, facets.0.material.',
	issues: [
		{ path: 'facets.0.pitch', message: 'pitch must be at most 24' },
		{
			path: 'facets.0.material',
			message:
				'material must be one of: asphalt_shingle, clay_tile, concrete_tile, metal, slate, wood_shake (got "shingle")'
		}
	]
};
