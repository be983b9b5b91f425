// The roof editor's outline helpers: sides as the panel lists them, the map's side buttons and
// what tapping one does. Compass and lengths are checked against hand geometry in a local
// metric plane (x east, y north) at the invented Wrenfield scene's latitude.
import { describe, expect, it } from 'vitest';
import {
	firstChoices,
	outlineSides,
	pickSide,
	roofFromOutline,
	sideMarks
} from '../../../src/lib/map/roof-outline';
import { localPlane, WRENFIELD } from '../estimating/fixtures';

const plane = localPlane(WRENFIELD.lat, WRENFIELD.lon);
const ring = plane.polygonM([
	[-7, -5],
	[7, -5],
	[7, 5],
	[-7, 5]
]).coordinates[0];

describe('outlineSides', () => {
	it('gives each side its length and the way it faces, for either winding', () => {
		const sides = outlineSides(ring);
		expect(sides.map((s) => s.facing)).toEqual(['south', 'east', 'north', 'west']);
		// 14 m = 45.93 ft and 10 m = 32.81 ft (1 ft = 0.3048 m exactly, NIST SP 811)
		expect(sides[0].lengthFt).toBeCloseTo(14 / 0.3048, 4);
		expect(sides[1].lengthFt).toBeCloseTo(10 / 0.3048, 4);
		const cw = [...ring].reverse();
		expect(outlineSides(cw).map((s) => s.facing)).toEqual(['west', 'north', 'east', 'south']);
	});
});

describe('side buttons and picking a side', () => {
	it('puts a button at the middle of every side, none on a flat roof', () => {
		const c = firstChoices(6, 4);
		const marks = sideMarks(ring, c);
		expect(marks).toHaveLength(4);
		const mid = plane.toLonLat([0, -5]);
		expect(marks[0].at[0]).toBeCloseTo(mid[0], 9);
		expect(marks[0].at[1]).toBeCloseTo(mid[1], 9);
		expect(marks.every((m) => !m.pressed)).toBe(true);
		expect(sideMarks(ring, { ...c, form: 'flat' })).toEqual([]);
	});

	it('turns a hip into a gable at the tapped side, then toggles sides', () => {
		let c = pickSide(firstChoices(6, 4), 1);
		expect(c.form).toBe('gable');
		expect(c.gableSides).toEqual([1]);
		c = pickSide(c, 3);
		expect(c.gableSides).toEqual([1, 3]);
		expect(sideMarks(ring, c).map((m) => m.pressed)).toEqual([false, true, false, true]);
		c = pickSide(c, 1);
		expect(c.gableSides).toEqual([3]);
	});
});

describe('roofFromOutline', () => {
	it('makes facets with ids of its own group, or says why it cannot', () => {
		const c = { ...firstChoices(6, 4), form: 'gable' as const, gableSides: [1, 3] };
		const r = roofFromOutline(ring, c, 'roof-a');
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(r.facets.map((f) => f.id)).toEqual(['roof-a-1', 'roof-a-2']);
		const bad = roofFromOutline(ring, { ...c, gableSides: [0] }, 'roof-a');
		expect(bad.ok).toBe(false);
		if (!bad.ok) expect(bad.message).toMatch(/side 1 cannot end in a gable/);
	});
});
