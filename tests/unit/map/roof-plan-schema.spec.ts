// The roof-plan body schema (src/lib/schemas/roof-plan.ts): what a save accepts and refuses.
import { describe, expect, it } from 'vitest';
import { planIssues, savePlanSchema } from '../../../src/lib/schemas/roof-plan';
import { FACET_LIMITS } from '../../../src/lib/schemas/facet';
import { planFacetsOf } from '../../../geodata/scene';
import { rectangleM } from './reference';

const SITE = '6e49f00b-b3c3-47fd-b252-cc6710c45a27';
const good = planFacetsOf('h03');

function issuesFor(facets: unknown[], extra: object = {}) {
	const body = { siteId: SITE, facets, ...extra };
	const r = savePlanSchema.safeParse(body);
	return r.success ? [] : planIssues(r.error, body);
}
const withBad = (geometry: unknown, over: object = {}) => [
	good[0],
	{ ...good[1], geometry, ...over }
];
const lon0 = -74.46;
const lat0 = 35.52;
const d = 0.0001; // about 9 m east-west, 11 m north-south

describe('savePlanSchema', () => {
	it('accepts the scene house traced exactly, with unlabelled edges filled in', () => {
		const r = savePlanSchema.safeParse({
			siteId: SITE,
			facets: good.map(({ edges: _e, ...f }) => f)
		});
		expect(r.success).toBe(true);
		if (r.success) {
			expect(r.data.facets).toHaveLength(4);
			expect(r.data.facets[1].edges).toEqual(new Array(6).fill(null));
			expect(r.data.source).toBe('remote');
		}
	});

	const cases: [string, unknown, RegExp][] = [
		[
			'a bow-tie',
			{
				type: 'Polygon',
				coordinates: [
					[
						[lon0, lat0],
						[lon0 + d, lat0 + d],
						[lon0 + d, lat0],
						[lon0, lat0 + d],
						[lon0, lat0]
					]
				]
			},
			/crosses itself/
		],
		[
			'two points',
			{
				type: 'Polygon',
				coordinates: [
					[
						[lon0, lat0],
						[lon0 + d, lat0],
						[lon0, lat0]
					]
				]
			},
			/at least 3 corners/
		],
		[
			'a longitude out of range',
			{
				type: 'Polygon',
				coordinates: [
					[
						[lon0, lat0],
						[190, lat0],
						[lon0 + d, lat0 + d],
						[lon0, lat0]
					]
				]
			},
			/longitude must be between -180 and 180/
		],
		[
			'a latitude out of range',
			{
				type: 'Polygon',
				coordinates: [
					[
						[lon0, lat0],
						[lon0 + d, 91],
						[lon0 + d, lat0 + d],
						[lon0, lat0]
					]
				]
			},
			/latitude must be between -90 and 90/
		],
		[
			'an unclosed ring',
			{
				type: 'Polygon',
				coordinates: [
					[
						[lon0, lat0],
						[lon0 + d, lat0],
						[lon0 + d, lat0 + d],
						[lon0, lat0 + d]
					]
				]
			},
			/not closed/
		],
		[
			'a string coordinate',
			{
				type: 'Polygon',
				coordinates: [
					[
						[lon0, lat0],
						['-74.4599', lat0],
						[lon0 + d, lat0 + d],
						[lon0, lat0]
					]
				]
			},
			/longitude must be a finite number/
		],
		[
			'null where a number goes (JSON has no NaN)',
			{
				type: 'Polygon',
				coordinates: [
					[
						[lon0, lat0],
						[null, lat0],
						[lon0 + d, lat0 + d],
						[lon0, lat0]
					]
				]
			},
			/finite number/
		],
		[
			'a hole',
			{
				type: 'Polygon',
				coordinates: [
					rectangleM(lat0, lon0, 5, 5).coordinates[0],
					rectangleM(lat0, lon0, 1, 1).coordinates[0]
				]
			},
			/exactly one ring/
		],
		['no ring', { type: 'Polygon', coordinates: [] }, /exactly one ring/],
		['an empty ring', { type: 'Polygon', coordinates: [[]] }, /at least 3 corners/],
		['a point for a polygon', { type: 'Point', coordinates: [lon0, lat0] }, /"Polygon"/],
		[
			'a facet of 0.2 m²',
			rectangleM(lat0, lon0, 0.4, 0.5),
			/only 0\.20 m².*smallest allowed is 0\.5 m²/
		],
		['a facet of 6,400 m²', rectangleM(lat0, lon0, 80, 80), /6,400 m².*largest allowed is 5,000 m²/]
	];
	for (const [what, geometry, message] of cases) {
		it(`refuses ${what}, naming facet 2 and its geometry`, () => {
			const issues = issuesFor(withBad(geometry));
			expect(issues.length).toBeGreaterThan(0);
			expect(issues[0].path.startsWith('facets.1.geometry')).toBe(true);
			expect(issues[0].message).toMatch(/^Facet 2 \(North slope\): /);
			expect(issues.map((i) => i.message).join(' | ')).toMatch(message);
			// nothing is said about the good facet
			expect(issues.some((i) => i.path.startsWith('facets.0'))).toBe(false);
		});
	}

	it(`refuses more than ${FACET_LIMITS.maxCorners} corners`, () => {
		const n = FACET_LIMITS.maxCorners + 1;
		const ring = Array.from({ length: n }, (_, i) => {
			const a = (2 * Math.PI * i) / n;
			return [lon0 + 0.0001 * Math.cos(a), lat0 + 0.0001 * Math.sin(a)];
		});
		ring.push(ring[0]);
		const noEdges = { edges: undefined };
		const issues = issuesFor(withBad({ type: 'Polygon', coordinates: [ring] }, noEdges));
		expect(issues[0].path).toBe('facets.1.geometry.coordinates.0');
		expect(issues[0].message).toMatch(/at most 200 corners/);
		// exactly the limit is fine
		const ok = ring.slice(0, n - 1);
		ok.push(ok[0]);
		expect(issuesFor(withBad({ type: 'Polygon', coordinates: [ok] }, noEdges))).toEqual([]);
	});

	it(`refuses more than ${FACET_LIMITS.maxFacets} facets and an empty plan`, () => {
		const many = Array.from({ length: FACET_LIMITS.maxFacets + 1 }, (_, i) => ({
			...good[0],
			id: `f${i}`
		}));
		expect(issuesFor(many)[0]).toMatchObject({
			path: 'facets',
			message: expect.stringMatching(/at most 100 facets/)
		});
		expect(issuesFor([])[0].message).toMatch(/at least one facet/);
	});

	it('refuses bad properties with a message per field', () => {
		const issues = issuesFor([
			{ ...good[0], pitch: 30, material: 'thatch', growth: 'G9', access: 'crane', stories: 4 }
		]);
		const paths = issues.map((i) => i.path).sort();
		expect(paths).toEqual([
			'facets.0.access',
			'facets.0.growth',
			'facets.0.material',
			'facets.0.pitch',
			'facets.0.stories'
		]);
		expect(issues.find((i) => i.path === 'facets.0.pitch')!.message).toMatch(/between 0 and 24/);
		expect(issues.find((i) => i.path === 'facets.0.material')!.message).toMatch(/asphalt_shingle/);
	});

	it('refuses edge labels that do not fit the outline, duplicate ids and unknown fields', () => {
		expect(issuesFor([{ ...good[0], edges: ['eave'] }])[0]).toMatchObject({
			path: 'facets.0.edges'
		});
		expect(issuesFor([good[0], { ...good[1], id: good[0].id }])[0]).toMatchObject({
			path: 'facets.1.id',
			message: expect.stringMatching(/also used by facet 1/)
		});
		expect(issuesFor([{ ...good[0], colour: 'red' }])[0].message).toMatch(
			/unknown field in facet: colour/
		);
		expect(issuesFor(good, { siteId: 'not-a-uuid' })[0].path).toBe('siteId');
		expect(issuesFor(good, { source: 'drone' })[0].path).toBe('source');
	});
});
