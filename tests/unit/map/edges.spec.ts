// Edge labels (eave, rake, ridge, hip, valley) carried across outline edits (src/lib/map/edges.ts).
import { describe, expect, it } from 'vitest';
import { carryEdges } from '../../../src/lib/map/edges';

const A = [0, 0];
const B = [4, 0];
const C = [4, 3];
const D = [0, 3];
const ring = [A, B, C, D, A];
const labels = ['eave', 'rake', 'ridge', 'rake'] as const;

describe('carryEdges', () => {
	it('keeps every label when corners only move', () => {
		const moved = [[0.1, 0], [4, 0.2], C, D, [0.1, 0]];
		expect(carryEdges(ring, [...labels], moved)).toEqual([...labels]);
	});

	it('gives both halves of a split segment its label', () => {
		const X = [2, 0];
		expect(carryEdges(ring, [...labels], [A, X, B, C, D, A])).toEqual([
			'eave',
			'eave',
			'rake',
			'ridge',
			'rake'
		]);
		const Y = [4, 1.5];
		expect(carryEdges(ring, [...labels], [A, B, Y, C, D, A])).toEqual([
			'eave',
			'rake',
			'rake',
			'ridge',
			'rake'
		]);
	});

	it('merges two segments into one label only when both agreed', () => {
		// remove B: eave + rake merge → no label; remove D: ridge + rake merge → no label
		expect(carryEdges(ring, [...labels], [A, C, D, A])).toEqual([null, 'ridge', 'rake']);
		const same = ['eave', 'eave', 'ridge', null] as const;
		expect(carryEdges(ring, [...same], [A, C, D, A])).toEqual(['eave', 'ridge', null]);
	});

	it('starts unlabelled when the old labels did not fit the old outline', () => {
		expect(carryEdges(ring, ['eave'], [A, B, C, A])).toEqual([null, null, null]);
	});
});
