/**
 * Leaflet for the light maps (Sites list, site page, New site) and the editor's no-WebGL
 * fallback. Imported dynamically: Leaflet touches `window` as soon as it loads.
 */
import L from 'leaflet';
import 'leaflet/dist/leaflet.css';
import './map-labels.css';
import type { Polygon } from 'geojson';
import type { PlanFacet } from '../schemas/roof-plan';
import { GROWTH_COLOURS, MAX_VIEW_ZOOM_256, type Imagery } from './imagery';
import { labelPoint } from './label-point';
import { escapeHtml } from './escape-html';

export { L };

export function imageryLayer(imagery: Imagery): L.TileLayer {
	const b = imagery.bounds;
	return L.tileLayer(imagery.tiles, {
		attribution: escapeHtml(imagery.attribution),
		maxZoom: MAX_VIEW_ZOOM_256,
		maxNativeZoom: imagery.maxZoom,
		// Below the sample's first level its tiles are shrunk, so the whole town still shows.
		minNativeZoom: imagery.sample ? imagery.minZoom : undefined,
		minZoom: imagery.sample ? Math.max(0, imagery.minZoom - 4) : 0,
		bounds: b ? L.latLngBounds([b[1], b[0]], [b[3], b[2]]) : undefined
	});
}

export function createBaseMap(
	el: HTMLElement,
	imagery: Imagery,
	view: { center: [number, number]; zoom: number },
	options: L.MapOptions = {}
): L.Map {
	const map = L.map(el, {
		center: [view.center[1], view.center[0]],
		zoom: view.zoom,
		maxZoom: MAX_VIEW_ZOOM_256,
		zoomSnap: 0.25,
		zoomControl: true,
		...options
	});
	map.attributionControl.setPrefix(false);
	L.control.scale({ position: 'bottomleft', maxWidth: 120 }).addTo(map);
	imageryLayer(imagery).addTo(map);
	return map;
}

export const toLatLngs = (g: Polygon): L.LatLngExpression[] =>
	g.coordinates[0].slice(0, -1).map(([lon, lat]) => [lat, lon] as [number, number]);

export function facetStyle(growth: PlanFacet['growth'], selected = false): L.PathOptions {
	return {
		color: selected ? '#ffb37a' : '#fbfaf7',
		weight: selected ? 4 : 2,
		fillColor: GROWTH_COLOURS[growth],
		fillOpacity: selected ? 0.5 : 0.38
	};
}

export function labelMarker(g: Polygon, text: string, detail: string, growth: string): L.Marker {
	const [lon, lat] = labelPoint(g);
	const el = document.createElement('div');
	el.className = 'cp-map-label';
	el.dataset.growth = growth;
	el.setAttribute('aria-hidden', 'true');
	const strong = document.createElement('strong');
	strong.textContent = text;
	const span = document.createElement('span');
	span.textContent = detail;
	el.append(strong, span);
	return L.marker([lat, lon], {
		icon: L.divIcon({ className: 'cp-plain', html: el, iconSize: undefined }),
		interactive: false,
		keyboard: false,
		// geoman must not snap drawn corners to label markers
		...({ pmIgnore: true, snapIgnore: true } as object)
	});
}

/** A numbered badge at a facet, for small read-only maps where full labels would collide. */
export function numberMarker(g: Polygon, n: number, growth: string): L.Marker {
	const [lon, lat] = labelPoint(g);
	const el = document.createElement('div');
	el.className = 'cp-map-num';
	el.dataset.growth = growth;
	el.setAttribute('aria-hidden', 'true');
	el.textContent = String(n);
	return L.marker([lat, lon], {
		icon: L.divIcon({ className: 'cp-plain', html: el, iconSize: [26, 26], iconAnchor: [13, 13] }),
		interactive: false,
		keyboard: false
	});
}

export function boundsOf(facets: readonly { geometry: Polygon }[]): L.LatLngBounds | null {
	const pts = facets.flatMap((f) => toLatLngs(f.geometry));
	return pts.length ? L.latLngBounds(pts) : null;
}
