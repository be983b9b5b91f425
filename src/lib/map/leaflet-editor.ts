/**
 * The roof editor where WebGL2 is missing: Leaflet with geoman drawing. Same facet table, same
 * save path; geoman does its own snapping to neighbouring corners and edges.
 */
import type { Polygon } from 'geojson';
import type { PlanFacet } from '../schemas/roof-plan';
import {
	sideButton,
	type EditorMap,
	type EditorMapOptions,
	type FacetLabel,
	type MapTestHandle
} from './editor-map';
import { EDGE_STYLES, MAX_VIEW_ZOOM_256 } from './imagery';
import { boundsOf, createBaseMap, facetStyle, L, labelMarker, toLatLngs } from './leaflet-base';

/* eslint-disable @typescript-eslint/no-explicit-any */

let geomanLoaded: Promise<unknown> | undefined;
/** geoman is a classic script that extends the global `L`. */
function loadGeoman() {
	(window as any).L = L;
	geomanLoaded ??= Promise.all([
		import('@geoman-io/leaflet-geoman-free'),
		import('@geoman-io/leaflet-geoman-free/dist/leaflet-geoman.css')
	]);
	return geomanLoaded;
}

const newId = () => `f${Date.now().toString(36)}${Math.random().toString(36).slice(2, 8)}`;

function toPolygon(layer: L.Polygon): Polygon {
	const g = layer.toGeoJSON(15).geometry as Polygon;
	return { type: 'Polygon', coordinates: [g.coordinates[0]] };
}

export async function createLeafletEditor(opts: EditorMapOptions): Promise<EditorMap> {
	await loadGeoman();
	const { container, imagery, events, readOnly } = opts;
	const map = createBaseMap(container, imagery, { center: opts.center, zoom: 20.5 });
	// Leaflet has drawn its first view once the imagery tiles in sight have loaded.
	map.eachLayer((l) => {
		if (l instanceof L.TileLayer) l.once('load', () => (handle.readyAt = performance.now()));
	});
	const pm = (map as any).pm;
	pm.setGlobalOptions({
		snappable: true,
		snapDistance: 14,
		allowSelfIntersection: false,
		tooltips: false,
		templineStyle: { color: '#c0693f', weight: 3 },
		hintlineStyle: { color: '#c0693f', dashArray: [5, 5] },
		pathOptions: facetStyle('G1', true)
	});

	const layers = new Map<string, L.Polygon>();
	const labelLayer = L.layerGroup().addTo(map);
	const edgeLayer = L.layerGroup().addTo(map);
	const sideLayer = L.layerGroup().addTo(map);
	let facets: readonly PlanFacet[] = [];
	let selected: string | null = null;
	let drawing = false;
	let snapping = true;

	map.on('pm:create', (e: any) => {
		const layer = e.layer as L.Polygon;
		const geometry = toPolygon(layer);
		map.removeLayer(layer);
		events.onCreate(newId(), geometry);
	});
	map.on('pm:drawstart', () => {
		drawing = true;
		events.onModeChange('draw');
	});
	map.on('pm:drawend', () => {
		drawing = false;
		events.onModeChange('browse');
	});
	map.on('click', () => {
		if (drawing || !selected) return;
		api.select(null);
		events.onSelect(null);
	});

	function render() {
		for (const l of layers.values()) l.remove();
		layers.clear();
		for (const f of facets) {
			const layer = L.polygon(toLatLngs(f.geometry), facetStyle(f.growth, f.id === selected));
			layer.addTo(map);
			layers.set(f.id, layer);
			if (readOnly) continue;
			layer.on('click', (ev: L.LeafletMouseEvent) => {
				L.DomEvent.stopPropagation(ev);
				if (drawing) return;
				api.select(f.id);
				events.onSelect(f.id);
			});
			layer.on('pm:edit', () => events.onChange(f.id, toPolygon(layer)));
			layer.on('pm:markerdrag', () => events.onLive(f.id, toPolygon(layer)));
			if (f.id === selected) {
				(layer as any).pm.enable({ snappable: snapping, snapDistance: 14, draggable: false });
			}
		}
	}

	const api: EditorMap = {
		kind: 'leaflet',
		get drawing() {
			return drawing;
		},
		setFacets(next, selectedId) {
			facets = next;
			selected = selectedId;
			render();
		},
		setLabels(list: readonly FacetLabel[]) {
			labelLayer.clearLayers();
			for (const l of list) labelMarker(l.geometry, l.text, l.detail, l.growth).addTo(labelLayer);
		},
		select(id) {
			if (selected === id) return;
			selected = id;
			render();
		},
		showOutlineSides(sides, onpick) {
			sideLayer.clearLayers();
			sides?.forEach((s, i) => {
				const icon = L.divIcon({
					html: sideButton(s, () => onpick(i)),
					className: '',
					// The button sizes itself (44 px touch target); centre it on the side.
					iconSize: undefined,
					iconAnchor: [22, 22]
				});
				L.marker([s.at[1], s.at[0]], {
					icon,
					keyboard: false,
					...({ pmIgnore: true } as object)
				}).addTo(sideLayer);
			});
		},
		highlightEdge(facetId, segment) {
			edgeLayer.clearLayers();
			const f = facetId ? facets.find((x) => x.id === facetId) : undefined;
			if (!f) return;
			const ring = f.geometry.coordinates[0];
			for (let i = 0; i < ring.length - 1; i++) {
				const kind = f.edges[i];
				const line: L.LatLngExpression[] = [
					[ring[i][1], ring[i][0]],
					[ring[i + 1][1], ring[i + 1][0]]
				];
				if (i === segment) {
					L.polyline(line, {
						color: '#fde68a',
						weight: 9,
						opacity: 0.9,
						interactive: false,
						...({ pmIgnore: true } as object)
					}).addTo(edgeLayer);
				}
				if (kind) {
					const s = EDGE_STYLES[kind];
					L.polyline(line, {
						color: s.colour,
						weight: 5,
						dashArray: s.dash ? s.dash.map((d) => d * 5).join(' ') : undefined,
						interactive: false,
						...({ pmIgnore: true } as object)
					}).addTo(edgeLayer);
				}
			}
		},
		startDrawing() {
			if (readOnly) return;
			pm.enableDraw('Polygon', { snappable: snapping, snapDistance: 14 });
		},
		finishDrawing() {
			if (drawing) pm.Draw.Polygon._finishShape();
		},
		cancelDrawing() {
			if (drawing) pm.disableDraw();
		},
		removeLastCorner() {
			if (!drawing) return false;
			pm.Draw.Polygon._removeLastVertex();
			return true;
		},
		placeCornerAtCentre() {
			if (drawing) pm.Draw.Polygon._createVertex({ latlng: map.getCenter() });
		},
		editCorners() {
			// Leaflet edits every corner of the selected facet at once; nothing to step through.
		},
		nudge(dx, dy) {
			const f = selected ? facets.find((x) => x.id === selected) : undefined;
			if (!f) return false;
			const moved = f.geometry.coordinates[0].map(([lon, lat]) => {
				const p = map.latLngToContainerPoint([lat, lon]);
				const q = map.containerPointToLatLng([p.x + dx, p.y + dy]);
				return [q.lng, q.lat];
			});
			events.onChange(f.id, { type: 'Polygon', coordinates: [moved] });
			return true;
		},
		deleteSelection() {
			return selected ? 'facet' : 'none';
		},
		setSnapping(on) {
			snapping = on;
			pm.setGlobalOptions({ snappable: on });
		},
		fitTo(list) {
			const b = boundsOf(list);
			if (b) map.fitBounds(b, { padding: [50, 50], maxZoom: 22, animate: false });
		},
		focus() {
			container.focus();
		},
		destroy() {
			if (window.__clearpitchMap === handle) delete window.__clearpitchMap;
			map.remove();
		}
	};

	const handle: MapTestHandle = {
		kind: 'leaflet',
		project([lon, lat]) {
			const p = map.latLngToContainerPoint([lat, lon]);
			const r = container.getBoundingClientRect();
			return { x: r.left + p.x, y: r.top + p.y };
		},
		fitBounds(bbox, paddingPx = 40) {
			return new Promise((resolve) => {
				map.fitBounds(
					[
						[bbox[1], bbox[0]],
						[bbox[3], bbox[2]]
					],
					{ padding: [paddingPx, paddingPx], animate: false, maxZoom: MAX_VIEW_ZOOM_256 }
				);
				requestAnimationFrame(() => resolve());
			});
		},
		zoom: () => map.getZoom(),
		readyAt: 0
	};
	window.__clearpitchMap = handle;
	return api;
}
