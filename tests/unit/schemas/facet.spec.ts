// One facet shape for roof plans and estimates: the same facet passes or fails both bodies, at
// the same path with the same words. The shape rules are GeoJSON's (RFC 7946): a Polygon's ring
// is closed, first and last positions equivalent, at least four positions (§3.1.6); positions
// are [longitude, latitude] (§3.1.1); a bbox of 2·n numbers may sit on any geometry (§5).
import { describe, expect, it } from 'vitest';
import { estimateRequestSchema } from '../../../src/lib/schemas/estimate';
import {
	FACET_LIMITS,
	facetIssues,
	facetListSchema,
	facetName
} from '../../../src/lib/schemas/facet';
import { savePlanSchema } from '../../../src/lib/schemas/roof-plan';
import { localPlane, WRENFIELD } from '../estimating/fixtures';

const plane = localPlane(WRENFIELD.lat, WRENFIELD.lon);
const SITE = '0b7e6c1e-4a3f-4b8e-9d2c-3f1a2b3c4d5e';

function goodFacet(overrides: Record<string, unknown> = {}): Record<string, unknown> {
	return JSON.parse(
		JSON.stringify({
			id: 'south',
			label: 'South slope',
			geometry: plane.rectFt(40, 15),
			pitch: 6,
			material: 'asphalt_shingle',
			growth: 'G2',
			access: 'ladder',
			stories: 1,
			...overrides
		})
	);
}

/** Both bodies' issues for the same facet list, as the API words them. */
function bothIssues(facets: unknown[]) {
	const plan = savePlanSchema.safeParse({ siteId: SITE, facets });
	const est = estimateRequestSchema.safeParse({ facets });
	return {
		plan: plan.success ? [] : facetIssues(plan.error.issues, facets),
		estimate: est.success ? [] : facetIssues(est.error.issues, facets)
	};
}

const ring = plane.rectFt(40, 15).coordinates[0];
const circle = (n: number) => {
	const r = Array.from({ length: n }, (_, k) => {
		const a = (2 * Math.PI * k) / n;
		return plane.toLonLat([10 * Math.cos(a), 10 * Math.sin(a)]);
	});
	return [...r, r[0]];
};

const BAD: Array<[string, Record<string, unknown>, string, RegExp]> = [
	[
		'an open ring',
		{ geometry: { type: 'Polygon', coordinates: [ring.slice(0, 4)] } },
		'facets.0.geometry.coordinates.0',
		/not closed/
	],
	[
		'two corners',
		{ geometry: { type: 'Polygon', coordinates: [[ring[0], ring[1], ring[0]]] } },
		'facets.0.geometry.coordinates.0',
		/at least 3 corners/
	],
	[
		'a hole',
		{ geometry: { type: 'Polygon', coordinates: [ring, ring] } },
		'facets.0.geometry.coordinates',
		/exactly one ring/
	],
	[
		'a crossing outline',
		{ geometry: { type: 'Polygon', coordinates: [[ring[0], ring[2], ring[1], ring[3], ring[0]]] } },
		'facets.0.geometry',
		/crosses itself/
	],
	[
		'a longitude out of range',
		{
			geometry: {
				type: 'Polygon',
				coordinates: [ring.map(([x, y], k) => [k === 0 || k === 4 ? x + 300 : x, y])]
			}
		},
		'facets.0.geometry.coordinates.0.0.0',
		/longitude must be between -180 and 180/
	],
	[
		'a Point',
		{ geometry: { type: 'Point', coordinates: ring[0] } },
		'facets.0.geometry.type',
		/"Polygon"/
	],
	[
		'the old field name',
		{ geometry: undefined, polygon: plane.rectFt(40, 15) },
		'facets.0',
		/unknown field in facet: polygon/
	],
	[
		'too many corners',
		{ geometry: { type: 'Polygon', coordinates: [circle(FACET_LIMITS.maxCorners + 1)] } },
		'facets.0.geometry.coordinates.0',
		/at most 200 corners/
	],
	[
		'a long label',
		{ label: 'x'.repeat(FACET_LIMITS.maxLabel + 1) },
		'facets.0.label',
		/at most 60 characters/
	],
	['a long id', { id: 'f'.repeat(FACET_LIMITS.maxId + 1) }, 'facets.0.id', /at most 64 characters/],
	['an id with a space', { id: 'south slope' }, 'facets.0.id', /letters, digits and - _ \. : only/],
	['a steep pitch', { pitch: 25 }, 'facets.0.pitch', /between 0 and 24/],
	['an unknown material', { material: 'vinyl' }, 'facets.0.material', /material must be one of/],
	['edges of the wrong count', { edges: ['eave'] }, 'facets.0.edges', /4 expected, 1 given/]
];

describe('the one facet schema', () => {
	it('accepts the same facet in a roof plan and an estimate, parsed the same way', () => {
		const f = goodFacet({ geometry: { ...plane.rectFt(40, 15), bbox: [0, 0, 1, 1] } });
		const plan = savePlanSchema.parse({ siteId: SITE, facets: [f] });
		const est = estimateRequestSchema.parse({ facets: [f] });
		expect(est.facets).toEqual(plan.facets);
		// The bbox is allowed in (RFC 7946 §5) and not kept: stored outlines are bare.
		expect(plan.facets[0].geometry).toEqual({
			type: 'Polygon',
			coordinates: f.geometry && plane.rectFt(40, 15).coordinates
		});
		expect(plan.facets[0].edges).toEqual([null, null, null, null]);
	});

	it.each(BAD)('refuses %s in both, at the same path with the same message', (_, o, path, re) => {
		const facets = [goodFacet({ label: 'Porch', ...o })];
		const { plan, estimate } = bothIssues(facets);
		expect(plan.length).toBeGreaterThan(0);
		expect(estimate).toEqual(plan);
		const hit = plan.find((i) => i.path === path && re.test(i.message));
		expect(hit, JSON.stringify(plan)).toBeDefined();
		const named = typeof o.label === 'string' ? 'Facet 1:' : 'Facet 1 (Porch):';
		for (const i of plan) expect(i.message.startsWith(named)).toBe(true);
	});

	it(`refuses more than ${FACET_LIMITS.maxFacets} facets, none, and an id used twice, in both`, () => {
		const many = Array.from({ length: FACET_LIMITS.maxFacets + 1 }, (_, i) =>
			goodFacet({ id: `f${i}` })
		);
		expect(bothIssues(many).plan).toEqual([
			{ path: 'facets', message: 'facets may list at most 100 facets' }
		]);
		expect(bothIssues(many).estimate).toEqual(bothIssues(many).plan);
		expect(facetListSchema.safeParse(many.slice(0, FACET_LIMITS.maxFacets)).success).toBe(true);
		expect(bothIssues([]).plan).toEqual([
			{ path: 'facets', message: 'facets must list at least one facet' }
		]);
		const twice = [
			goodFacet(),
			goodFacet({ label: 'North slope', geometry: plane.rectFt(40, 15, 0, 15) })
		];
		expect(bothIssues(twice).plan).toEqual([
			{
				path: 'facets.1.id',
				message: 'Facet 2 (North slope): facet id "south" is also used by facet 1'
			}
		]);
		expect(bothIssues(twice).estimate).toEqual(bothIssues(twice).plan);
	});

	it('names a facet by number and label, never by its id', () => {
		expect(facetName(2, { id: 'f-7c2e', label: ' Garage south slope ' })).toBe(
			'Facet 3 (Garage south slope)'
		);
		expect(facetName(0, { id: 'f-7c2e', label: '' })).toBe('Facet 1');
		expect(facetName(0, { id: 'f-7c2e', label: 'x'.repeat(61) })).toBe('Facet 1');
		expect(facetName(4, null)).toBe('Facet 5');
	});
});
