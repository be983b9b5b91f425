import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { fieldIssues, polygonSchema, positionSchema } from '../../../src/lib/schemas/estimate';

/**
 * The ring checks its positions in one pass for speed. Whatever a caller sends, the issues it
 * raises on positions must be the ones the declared positionSchema (what the OpenAPI document
 * shows) raises position by position: same paths and messages. Order is compared by path, since
 * zod's tuple reports an altitude before a longitude of the same position.
 */
const declared = z.array(positionSchema);

function positionIssues(ring: unknown[]) {
	const r = polygonSchema.safeParse({ type: 'Polygon', coordinates: [ring] });
	if (r.success) return [];
	const prefix = 'coordinates.0.';
	return fieldIssues(r.error.issues)
		.filter((i) => i.path.startsWith(prefix) && i.path.length > prefix.length)
		.map((i) => ({ ...i, path: i.path.slice(prefix.length) }))
		.sort(byPath);
}

const byPath = (a: { path: string }, b: { path: string }) =>
	a.path.localeCompare(b.path, 'en', { numeric: true });

function declaredIssues(ring: unknown[]) {
	const r = declared.safeParse(ring);
	return r.success ? [] : fieldIssues(r.error.issues).sort(byPath);
}

const coordinate = fc.oneof(
	fc.double({ min: -200, max: 200, noNaN: true }),
	fc.constantFrom(-180, 180, -90, 90, -180.000001, 90.000001, 0),
	fc.constantFrom(Number.NaN, Infinity, -Infinity, undefined, null, '12.5', true, [], {})
);
const position = fc.oneof(
	{ weight: 4, arbitrary: fc.tuple(coordinate, coordinate) },
	{ weight: 2, arbitrary: fc.array(coordinate, { minLength: 0, maxLength: 5 }) },
	{ weight: 1, arbitrary: fc.constantFrom(null, 'x', 5, { 0: 1, 1: 2, length: 2 }, undefined) }
);

describe('ring position check', () => {
	it('raises exactly the declared position schema’s issues (fast-check)', () => {
		fc.assert(
			fc.property(fc.array(position, { minLength: 0, maxLength: 12 }), (ring) => {
				expect(positionIssues(ring)).toEqual(declaredIssues(ring));
			}),
			{ numRuns: 2000 }
		);
	});

	it('accepts what the declared schema accepts and keeps the positions as sent', () => {
		const ring = [
			[-93.1, 44.9],
			[-93.0999, 44.9, 12.5],
			[-93.0999, 44.9001],
			[-93.1, 44.9]
		];
		expect(declaredIssues(ring)).toEqual([]);
		const r = polygonSchema.safeParse({ type: 'Polygon', coordinates: [ring] });
		expect(r.success && r.data.coordinates[0]).toEqual(ring);
	});

	it('names the bad number on the boundary of the ranges (RFC 7946 §3.1.1: lon then lat)', () => {
		expect(positionIssues([[180.0000001, 90]])).toEqual([
			{ path: '0.0', message: 'longitude must be at most 180' }
		]);
		expect(positionIssues([[-180, -90.5]])).toEqual([
			{ path: '0.1', message: 'latitude must be at least -90' }
		]);
		expect(positionIssues([[12]])).toEqual([{ path: '0.1', message: 'latitude is required' }]);
	});
});
