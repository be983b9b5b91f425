// The draw layers (src/lib/map/draw-styles.ts) checked against the MapLibre Style Specification
// with its reference validator, @maplibre/maplibre-gl-style-spec (installed with maplibre-gl).
import { validateStyleMin } from '@maplibre/maplibre-gl-style-spec';
import { describe, expect, it } from 'vitest';
import { DRAW_STYLES } from '../../../src/lib/map/draw-styles';
import { GROWTH_COLOURS } from '../../../src/lib/map/imagery';

const styleWith = (layers: unknown[]) => ({
	version: 8,
	sources: { draw: { type: 'geojson', data: { type: 'FeatureCollection', features: [] } } },
	layers: layers.map((l) => ({ ...(l as object), source: 'draw' }))
});

describe('draw styles', () => {
	it('are valid MapLibre style layers', () => {
		const errors = validateStyleMin(styleWith(DRAW_STYLES) as never);
		expect(errors.map((e) => e.message)).toEqual([]);
	});
	it('the validator does refuse a broken layer (so the check above can fail)', () => {
		const broken = [{ ...DRAW_STYLES[0], paint: { 'fill-color': ['match', ['get', 'x']] } }];
		expect(validateStyleMin(styleWith(broken) as never).length).toBeGreaterThan(0);
	});
	it('fill every growth grade with its legend colour', () => {
		const fill = DRAW_STYLES.find((l) => l.id === 'cp-fill')!;
		const match = (fill.paint as Record<string, unknown>)['fill-color'] as unknown[];
		for (const [grade, colour] of Object.entries(GROWTH_COLOURS)) {
			expect(match[match.indexOf(grade) + 1]).toBe(colour);
		}
	});
});
