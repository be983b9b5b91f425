import { pointOnFeature } from '@turf/turf';
import type { Polygon } from 'geojson';

/** Where a facet's label sits: its centroid, or a point inside it when an L-shape puts that outside. */
export function labelPoint(g: Polygon): [number, number] {
	const p = pointOnFeature({ type: 'Feature', properties: {}, geometry: g }).geometry.coordinates;
	return [p[0], p[1]];
}
