/**
 * How mapbox-gl-draw paints facets in the MapLibre editor: MapLibre style layers (paint and layout
 * objects with expressions), kept apart from the editor's behaviour.
 */
import { GROWTH_COLOURS } from './imagery';

const ACTIVE = ['==', ['get', 'active'], 'true'];
/** A MapLibre expression: a facet's fill from its growth grade (clay for an unknown grade). */
export const growthColour = [
	'match',
	['get', 'user_growth'],
	...Object.entries(GROWTH_COLOURS).flat(),
	'#c0693f'
];

/** Clearpitch's look for facets: fill by growth grade, light outline, clay when selected. */
export const DRAW_STYLES = [
	{
		id: 'cp-fill',
		type: 'fill',
		filter: ['all', ['==', '$type', 'Polygon']],
		paint: { 'fill-color': growthColour, 'fill-opacity': ['case', ACTIVE, 0.5, 0.38] }
	},
	{
		id: 'cp-casing',
		type: 'line',
		filter: ['any', ['==', '$type', 'LineString'], ['==', '$type', 'Polygon']],
		layout: { 'line-cap': 'round', 'line-join': 'round' },
		paint: { 'line-color': '#1b2229', 'line-width': ['case', ACTIVE, 7, 4], 'line-opacity': 0.6 }
	},
	{
		id: 'cp-outline',
		type: 'line',
		filter: ['any', ['==', '$type', 'LineString'], ['==', '$type', 'Polygon']],
		layout: { 'line-cap': 'round', 'line-join': 'round' },
		paint: {
			'line-color': ['case', ACTIVE, '#ffb37a', '#fbfaf7'],
			'line-width': ['case', ACTIVE, 4, 2]
		}
	},
	{
		id: 'cp-midpoint',
		type: 'circle',
		filter: ['all', ['==', '$type', 'Point'], ['==', 'meta', 'midpoint']],
		paint: {
			'circle-radius': 5,
			'circle-color': '#fbfaf7',
			'circle-stroke-color': '#1f4d3a',
			'circle-stroke-width': 2
		}
	},
	{
		id: 'cp-vertex-halo',
		type: 'circle',
		filter: ['all', ['==', '$type', 'Point'], ['==', 'meta', 'vertex']],
		paint: { 'circle-radius': ['case', ACTIVE, 10, 7], 'circle-color': '#fbfaf7' }
	},
	{
		id: 'cp-vertex',
		type: 'circle',
		filter: ['all', ['==', '$type', 'Point'], ['==', 'meta', 'vertex']],
		paint: {
			'circle-radius': ['case', ACTIVE, 7, 4.5],
			'circle-color': ['case', ACTIVE, '#c0693f', '#1f4d3a']
		}
	}
];
