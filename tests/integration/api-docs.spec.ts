// The OpenAPI document and the API page, against the built server: the document is valid
// OpenAPI 3.1 (checked with the official JSON Schemas), says what the handlers check, and its
// example answer is what the live API returns.
import { Validator } from '@seriousme/openapi-schema-validator';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sessionFor } from '../helpers/http';
import { seededDataDir, startServer, type TestServer } from '../helpers/server';

let server: TestServer;
let sales: string;
let crew: string;

beforeAll(async () => {
	server = await startServer(seededDataDir('api-docs'));
	sales = await sessionFor(server.url, 'sales');
	crew = await sessionFor(server.url, 'crew');
});
afterAll(async () => server?.stop());

const get = (path: string, cookie?: string, accept = 'application/json') =>
	fetch(server.url + path, {
		redirect: 'manual',
		headers: { accept, ...(cookie ? { cookie } : {}) }
	});

describe('/api/openapi.json', () => {
	it('is a valid OpenAPI 3.1 document (official schema, via @seriousme/openapi-schema-validator)', async () => {
		const res = await get('/api/openapi.json', sales);
		expect(res.status).toBe(200);
		const doc = await res.json();
		const validator = new Validator();
		const result = await validator.validate(doc);
		expect(result.errors ?? []).toEqual([]);
		expect(result.valid).toBe(true);
		expect(validator.version).toBe('3.1');
	});

	it('lists every endpoint with the limits the request schema enforces', async () => {
		const doc = await (await get('/api/openapi.json', sales)).json();
		expect(Object.keys(doc.paths).sort()).toEqual([
			'/api/estimates',
			'/api/estimates/{id}',
			'/api/rate-cards',
			'/api/roof-plans'
		]);
		expect(Object.keys(doc.paths['/api/estimates']).sort()).toEqual(['get', 'post']);
		expect(Object.keys(doc.paths['/api/estimates/{id}']).sort()).toEqual([
			'get',
			'parameters',
			'patch'
		]);
		const req = doc.components.schemas.EstimateRequest;
		// facets or roofPlanId (facets sent with a roofPlanId must be that plan's): the schema cannot
		// say so with refinements, so the operation's description does; both fields are in it.
		expect(req.required ?? []).not.toContain('facets');
		expect(req.properties.roofPlanId).toMatchObject({ type: 'string', format: 'uuid' });
		expect(doc.paths['/api/estimates'].post.description).toMatch(/roofPlanId/);
		expect(doc.paths['/api/estimates'].post.description).toMatch(/must be that plan’s facets/);
		const facet = req.properties.facets.items;
		expect(facet.properties.pitch).toMatchObject({ type: 'number', minimum: 0, maximum: 24 });
		expect(facet.properties.material.enum).toEqual([
			'asphalt_shingle',
			'clay_tile',
			'concrete_tile',
			'metal',
			'slate',
			'wood_shake'
		]);
		expect(facet.additionalProperties).toBe(false);
		// One facet shape: a roof plan's facets and an estimate's are the same schema, outline
		// called geometry, with the same limits.
		const planFacets = doc.components.schemas.RoofPlanSave.properties.facets;
		expect(planFacets.items).toEqual(facet);
		expect(doc.components.schemas.Facet).toEqual(facet);
		expect(facet.required).toEqual(expect.arrayContaining(['id', 'geometry', 'pitch']));
		expect(facet.properties).not.toHaveProperty('polygon');
		expect(facet.properties.label.maxLength).toBe(60);
		expect(facet.properties.id.maxLength).toBe(64);
		expect(req.properties.facets.maxItems).toBe(100);
		expect(planFacets.maxItems).toBe(100);
		expect(facet.properties.geometry.properties.coordinates.items.maxItems).toBe(201);
		const pageSize = doc.paths['/api/estimates'].get.parameters.find(
			(p: { name: string }) => p.name === 'pageSize'
		);
		expect(pageSize.schema.maximum).toBe(100);
		expect(Object.keys(doc.paths['/api/estimates'].post.responses)).toEqual(
			expect.arrayContaining(['200', '201', '400', '401', '403', '413', '415'])
		);
	});

	it('shows as its example the answer the live API gives to its example request', async () => {
		const doc = await (await get('/api/openapi.json', sales)).json();
		const post = doc.paths['/api/estimates'].post;
		const res = await fetch(server.url + '/api/estimates', {
			method: 'POST',
			headers: { cookie: sales, origin: server.url, 'content-type': 'application/json' },
			body: JSON.stringify(post.requestBody.content['application/json'].example)
		});
		expect(res.status).toBe(200);
		const live = await res.json();
		const example = post.responses['200'].content['application/json'].example;
		expect({ ...live, rateCard: null }).toEqual({ ...example, rateCard: null });
		// docs/estimating-model.md §13 W1 (JLC slope factor): the example is the 40 × 30 ft gable
		// at 6/12.
		expect(live.facets[0].squares.toFixed(2)).toBe('13.42');
	});

	it('is for office roles only', async () => {
		expect((await get('/api/openapi.json')).status).toBe(401);
		expect((await get('/api/openapi.json', crew)).status).toBe(403);
	});
});

describe('/api/docs', () => {
	it('renders every path, method, the auth and the error format for a signed-in browser', async () => {
		const res = await get('/api/docs', sales, 'text/html');
		expect(res.status).toBe(200);
		const html = await res.text();
		for (const text of [
			'/api/estimates',
			'/api/estimates/{id}',
			'/api/rate-cards',
			'PATCH',
			'Authorization: Bearer',
			'facets.0.pitch',
			'413',
			'415'
		]) {
			expect(html).toContain(text);
		}
		expect(html).not.toMatch(/<script[^>]+src="https?:/);
	});

	it('is refused to crew and to a signed-out visitor', async () => {
		expect((await get('/api/docs', crew, 'text/html')).status).toBe(403);
		expect((await get('/api/docs', undefined, 'text/html')).status).toBe(401);
	});
});

describe('/api/rate-cards', () => {
	it('lists the seeded default version for sales to read', async () => {
		const res = await get('/api/rate-cards', sales);
		expect(res.status).toBe(200);
		const { items } = await res.json();
		expect(items).toHaveLength(1);
		expect(items[0]).toMatchObject({ version: 1, isDefault: true });
		// docs/estimating-model.md §12 default rate card (demo defaults, from memory): asphalt $32
		// a square.
		expect(items[0].card.materials.asphalt_shingle.perSquareCents).toBe(3200);
	});
});
