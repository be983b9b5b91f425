/**
 * The roof editor on MapLibre GL with mapbox-gl-draw. Loaded only by the editor page, through a
 * dynamic import, because MapLibre is large and needs WebGL2. Draw's modes are wrapped so every
 * corner snaps to neighbouring facets, and so outlines report live while they change.
 */
import {
	LngLatBounds,
	Map as MlMap,
	Marker,
	setWorkerUrl,
	type GeoJSONSource,
	type MapMouseEvent,
	type StyleSpecification
} from 'maplibre-gl';
import MapboxDraw, { type DrawMode } from '@mapbox/mapbox-gl-draw';
import workerUrl from 'maplibre-gl/dist/maplibre-gl-worker.mjs?url';
import 'maplibre-gl/dist/maplibre-gl.css';
import './maplibre-editor.css';
import './map-labels.css';
import type { Feature, FeatureCollection, Polygon, Position } from 'geojson';
import type { PlanFacet } from '../schemas/roof-plan';
import {
	sideButton,
	type EditorMap,
	type EditorMapOptions,
	type FacetLabel,
	type MapTestHandle
} from './editor-map';
import { DRAW_STYLES, growthColour } from './draw-styles';
import { EDGE_STYLES, MAX_VIEW_ZOOM_256 } from './imagery';
import { labelPoint } from './label-point';
import { escapeHtml } from './escape-html';
import { createSnapIndex, snapPoint, snapTolerancePx, type LonLat, type SnapIndex } from './snap';

/* eslint-disable @typescript-eslint/no-explicit-any */
type DrawEvent = MapMouseEvent & { featureTarget?: unknown; lngLat: { lng: number; lat: number } };

let glued = false;
/** mapbox-gl-draw looks for Mapbox's class names; without CANVAS, Enter and Escape never fire. */
function glueDrawToMapLibre() {
	if (glued) return;
	Object.assign(MapboxDraw.constants.classes, {
		CANVAS: 'maplibregl-canvas',
		CONTROL_BASE: 'maplibregl-ctrl',
		CONTROL_PREFIX: 'maplibregl-ctrl-',
		CONTROL_GROUP: 'maplibregl-ctrl-group',
		ATTRIBUTION: 'maplibregl-ctrl-attrib'
	});
	setWorkerUrl(workerUrl);
	glued = true;
}

function styleFor(imagery: EditorMapOptions['imagery']): StyleSpecification {
	return {
		version: 8,
		sources: {
			imagery: {
				type: 'raster',
				tiles: [imagery.tiles],
				// MapLibre counts zoom in 512-px tiles: a 256-px source loads one level deeper.
				tileSize: 256,
				minzoom: imagery.minZoom,
				maxzoom: imagery.maxZoom,
				...(imagery.bounds ? { bounds: imagery.bounds } : {}),
				attribution: escapeHtml(imagery.attribution)
			}
		},
		layers: [
			{ id: 'ground', type: 'background', paint: { 'background-color': '#d8d1c3' } },
			{ id: 'imagery', type: 'raster', source: 'imagery' }
		]
	};
}

const closeRing = (ring: Position[]): Position[] => (ring.length > 0 ? [...ring, ring[0]] : ring);

function polygonOf(f: Feature | undefined): Polygon | null {
	return f && f.geometry?.type === 'Polygon' ? (f.geometry as Polygon) : null;
}

function bboxOf(facets: readonly PlanFacet[]): [number, number, number, number] | null {
	let w = Infinity,
		s = Infinity,
		e = -Infinity,
		n = -Infinity;
	for (const f of facets)
		for (const [x, y] of f.geometry.coordinates[0]) {
			if (x < w) w = x;
			if (x > e) e = x;
			if (y < s) s = y;
			if (y > n) n = y;
		}
	return Number.isFinite(w) ? [w, s, e, n] : null;
}

function pointerKind(ev: Event | undefined): 'mouse' | 'pen' | 'touch' {
	if (!ev) return 'mouse';
	if (typeof TouchEvent !== 'undefined' && ev instanceof TouchEvent) return 'touch';
	const pt = (ev as PointerEvent).pointerType;
	return pt === 'touch' ? 'touch' : pt === 'pen' ? 'pen' : 'mouse';
}

export async function createMapLibreEditor(opts: EditorMapOptions): Promise<EditorMap> {
	glueDrawToMapLibre();
	const { container, imagery, events, readOnly } = opts;
	const map = new MlMap({
		container,
		style: styleFor(imagery),
		center: opts.center,
		zoom: 19.6,
		// MAX_VIEW_ZOOM_256 counts 256-px tiles; MapLibre's zoom is one less for the same scale.
		maxZoom: MAX_VIEW_ZOOM_256 - 1,
		attributionControl: { compact: true },
		dragRotate: false,
		pitchWithRotate: false,
		touchPitch: false
	});
	map.touchZoomRotate.disableRotation();
	map.keyboard.disableRotation();
	let readyAt = 0;
	await new Promise<void>((resolve, reject) => {
		map.once('load', () => {
			readyAt = performance.now();
			resolve();
		});
		map.once('error', (e) => {
			if (!map.loaded()) console.warn('map error before load', e.error);
		});
		setTimeout(() => (map.loaded() ? resolve() : reject(new Error('map load timed out'))), 20000);
	});

	let snapping = true;
	let snapCache: { index: SnapIndex; exclude: string | null } | null = null;
	let drawState: any = null;
	/**
	 * The active draw mode's context (`this` inside its handlers). Draw offers no public way to
	 * reach it from outside, and the toolbar's cancel / place-corner buttons need its methods.
	 */
	let drawMode: any = null;
	const trackMode = (mode: any) => {
		drawMode = mode;
	};
	let directState: any = null;
	let selectId: string | null = null;
	let liveFrame = 0;
	const labels = new Map<string, Marker>();
	const labelShapes = new Map<string, Polygon>();
	const segmentMarkers: Marker[] = [];
	const sideMarkers: Marker[] = [];
	let facetsNow: readonly PlanFacet[] = [];

	map.addSource('cp-snap', { type: 'geojson', data: emptyFc() });
	map.addSource('cp-edges', { type: 'geojson', data: emptyFc() });
	map.addSource('cp-static', { type: 'geojson', data: emptyFc() });

	let draw: MapboxDraw | null = null;

	if (readOnly) {
		map.addLayer({
			id: 'cp-static-fill',
			type: 'fill',
			source: 'cp-static',
			paint: { 'fill-color': growthColour as any, 'fill-opacity': 0.38 }
		});
		map.addLayer({
			id: 'cp-static-line',
			type: 'line',
			source: 'cp-static',
			paint: { 'line-color': '#fbfaf7', 'line-width': 2 }
		});
	} else {
		draw = new MapboxDraw({
			displayControlsDefault: false,
			userProperties: true,
			keybindings: true,
			touchEnabled: true,
			boxSelect: false,
			clickBuffer: 4,
			touchBuffer: 24,
			styles: DRAW_STYLES,
			modes: { ...MapboxDraw.modes, ...wrappedModes() }
		});
		map.addControl(draw as any);
	}

	for (const [kind, s] of Object.entries(EDGE_STYLES)) {
		map.addLayer({
			id: `cp-edge-${kind}`,
			type: 'line',
			source: 'cp-edges',
			filter: ['==', ['get', 'kind'], kind],
			layout: { 'line-cap': 'butt' },
			paint: {
				'line-color': s.colour,
				'line-width': 5,
				...(s.dash ? { 'line-dasharray': [...s.dash] } : {})
			}
		});
	}
	map.addLayer({
		id: 'cp-edge-highlight',
		type: 'line',
		source: 'cp-edges',
		filter: ['==', ['get', 'highlight'], true],
		paint: { 'line-color': '#fde68a', 'line-width': 9, 'line-opacity': 0.9 }
	});
	map.addLayer({
		id: 'cp-snap',
		type: 'circle',
		source: 'cp-snap',
		paint: {
			'circle-radius': 9,
			'circle-color': 'rgba(0,0,0,0)',
			'circle-stroke-color': '#c0693f',
			'circle-stroke-width': 3
		}
	});

	/** Labels shrink with their facet on screen, so small facets stay readable, not buried. */
	function sizeLabel(id: string) {
		const g = labelShapes.get(id);
		const el = labels.get(id)?.getElement();
		if (!g || !el) return;
		let minX = Infinity,
			maxX = -Infinity,
			minY = Infinity,
			maxY = -Infinity;
		for (const c of g.coordinates[0]) {
			const p = map.project(c as [number, number]);
			minX = Math.min(minX, p.x);
			maxX = Math.max(maxX, p.x);
			minY = Math.min(minY, p.y);
			maxY = Math.max(maxY, p.y);
		}
		const w = maxX - minX;
		const h = maxY - minY;
		el.dataset.size = w < 48 || h < 24 ? 'hidden' : w < 110 || h < 56 ? 'small' : 'full';
	}
	map.on('zoomend', () => {
		for (const id of labels.keys()) sizeLabel(id);
	});

	function emptyFc(): FeatureCollection {
		return { type: 'FeatureCollection', features: [] };
	}

	function snapSource(): GeoJSONSource {
		return map.getSource('cp-snap') as GeoJSONSource;
	}

	function showSnap(p: LonLat | null) {
		snapSource().setData(
			p
				? {
						type: 'FeatureCollection',
						features: [
							{ type: 'Feature', properties: {}, geometry: { type: 'Point', coordinates: p } }
						]
					}
				: emptyFc()
		);
	}

	function targets(exclude: string | null): SnapIndex {
		if (snapCache && snapCache.exclude === exclude) return snapCache.index;
		const all = draw ? draw.getAll().features : [];
		const rings = [];
		for (const f of all) {
			const g = polygonOf(f);
			const id = String(f.id);
			if (!g || id === exclude || id === drawState?.polygon?.id) continue;
			rings.push({ facetId: id, ring: g.coordinates[0] });
		}
		snapCache = { index: createSnapIndex(rings), exclude };
		return snapCache.index;
	}
	const invalidateSnap = () => (snapCache = null);

	const project = (p: LonLat) => {
		const q = map.project(p as [number, number]);
		return { x: q.x, y: q.y };
	};

	/** The event with its position moved onto the nearest corner or edge, if one is close. */
	function snapped(
		e: DrawEvent,
		exclude: string | null,
		extra?: { first: LonLat | null }
	): DrawEvent & { closes?: boolean } {
		const alt = (e.originalEvent as MouseEvent | undefined)?.altKey;
		if (!snapping || alt || !e.point) {
			showSnap(null);
			return e;
		}
		const tol = snapTolerancePx(pointerKind(e.originalEvent));
		if (extra?.first) {
			const f = project(extra.first);
			if (Math.hypot(f.x - e.point.x, f.y - e.point.y) <= tol) {
				showSnap(extra.first);
				return {
					...e,
					lngLat: { lng: extra.first[0], lat: extra.first[1] },
					closes: true
				} as DrawEvent & { closes: boolean };
			}
		}
		const hit = snapPoint(targets(exclude), e.point, project, tol);
		showSnap(hit ? hit.lonLat : null);
		if (!hit) return e;
		return { ...e, lngLat: { lng: hit.lonLat[0], lat: hit.lonLat[1] } } as DrawEvent;
	}

	function reportLive(id: string, ring: Position[] | null) {
		cancelAnimationFrame(liveFrame);
		liveFrame = requestAnimationFrame(() => {
			if (!ring) return events.onLive(id, null);
			events.onLive(id, { type: 'Polygon', coordinates: [closeRing(ring)] });
		});
	}

	function render() {
		drawMode?._ctx?.store?.render();
	}

	/** Corners placed so far plus the one following the pointer. */
	const placed = (state: any): Position[] =>
		state.polygon.coordinates[0].slice(0, state.currentVertexPosition + 1);

	function wrappedModes(): Record<string, DrawMode> {
		const DP = MapboxDraw.modes.draw_polygon;
		const DS = MapboxDraw.modes.direct_select;
		const SS = MapboxDraw.modes.simple_select;

		const firstCorner = (state: any): LonLat | null => {
			const ring = state.polygon.coordinates[0];
			return state.currentVertexPosition >= 3 ? (ring[0] as LonLat) : null;
		};

		const draw_polygon: DrawMode = {
			...DP,
			onSetup(this: any, o: unknown) {
				const state = DP.onSetup.call(this, o);
				drawState = state;
				trackMode(this);
				invalidateSnap();
				return state;
			},
			onMouseMove(this: any, state: any, e: DrawEvent) {
				const s = snapped(e, null, { first: firstCorner(state) });
				DP.onMouseMove.call(this, state, s);
				if (state.currentVertexPosition >= 2) reportLive(state.polygon.id, placed(state));
			},
			onClick(this: any, state: any, e: DrawEvent) {
				const s = snapped(e, null, { first: firstCorner(state) });
				if (s.closes) {
					return this.changeMode('simple_select', { featureIds: [state.polygon.id] });
				}
				return DP.onClick.call(this, state, s);
			},
			onTap(this: any, state: any, e: DrawEvent) {
				const s = snapped(e, null, { first: firstCorner(state) });
				if (s.closes) {
					return this.changeMode('simple_select', { featureIds: [state.polygon.id] });
				}
				return DP.onTap.call(this, state, s);
			},
			onKeyDown(this: any, state: any, e: KeyboardEvent) {
				if (e.key === ' ') {
					e.preventDefault();
					placeAtCentre(this, state);
				}
			},
			onStop(this: any, state: any) {
				drawState = null;
				showSnap(null);
				reportLive(state.polygon.id, null);
				DP.onStop.call(this, state);
			}
		};

		const direct_select: DrawMode = {
			...DS,
			onSetup(this: any, o: unknown) {
				const state = DS.onSetup.call(this, o);
				directState = state;
				trackMode(this);
				return state;
			},
			dragVertex(this: any, state: any, e: DrawEvent, delta: unknown) {
				if (state.selectedCoordPaths.length !== 1) {
					DS.dragVertex.call(this, state, e, delta);
				} else {
					// The corner follows the pointer (snapped) rather than adding up deltas.
					const s = snapped(e, state.featureId);
					state.feature.updateCoordinate(state.selectedCoordPaths[0], s.lngLat.lng, s.lngLat.lat);
				}
				reportLive(state.featureId, state.feature.getCoordinates()[0]);
			},
			dragFeature(this: any, state: any, e: DrawEvent, delta: unknown) {
				DS.dragFeature.call(this, state, e, delta);
				reportLive(state.featureId, state.feature.getCoordinates()[0]);
			},
			onMouseUp(this: any, state: any, e: unknown) {
				showSnap(null);
				return DS.onMouseUp.call(this, state, e);
			},
			onTouchEnd(this: any, state: any, e: unknown) {
				showSnap(null);
				return DS.onTouchEnd.call(this, state, e);
			},
			onStop(this: any, state: any) {
				directState = null;
				showSnap(null);
				DS.onStop.call(this, state);
			}
		};

		const simple_select: DrawMode = {
			...SS,
			onSetup(this: any, o: unknown) {
				trackMode(this);
				return SS.onSetup.call(this, o);
			},
			onDrag(this: any, state: any, e: unknown) {
				const r = SS.onDrag.call(this, state, e);
				const [f] = this.getSelected();
				if (f && state.dragMoving) reportLive(f.id, f.getCoordinates()[0]);
				return r;
			}
		};

		return { draw_polygon, direct_select, simple_select };
	}

	function placeAtCentre(mode: any, state: any) {
		const c = map.getCenter();
		const pt = map.project(c);
		const fake = {
			lngLat: { lng: c.lng, lat: c.lat },
			point: pt,
			originalEvent: new MouseEvent('click'),
			featureTarget: undefined
		} as unknown as DrawEvent;
		const s = snapped(fake, null, { first: firstCornerOf(state) });
		if (s.closes) {
			mode.changeMode('simple_select', { featureIds: [state.polygon.id] });
			return;
		}
		mode.clickAnywhere(state, s);
		mode.onMouseMove(state, s);
		mode._ctx.store.render();
	}
	const firstCornerOf = (state: any): LonLat | null =>
		state.currentVertexPosition >= 3 ? (state.polygon.coordinates[0][0] as LonLat) : null;

	if (draw) {
		const geometryOf = (f: Feature) => polygonOf(f);
		map.on('draw.create' as any, (e: any) => {
			invalidateSnap();
			for (const f of e.features as Feature[]) {
				const g = geometryOf(f);
				if (g) events.onCreate(String(f.id), g);
			}
		});
		map.on('draw.update' as any, (e: any) => {
			invalidateSnap();
			for (const f of e.features as Feature[]) {
				const g = geometryOf(f);
				if (g) events.onChange(String(f.id), g);
			}
		});
		map.on('draw.delete' as any, (e: any) => {
			invalidateSnap();
			for (const f of e.features as Feature[]) events.onDelete(String(f.id));
		});
		map.on('draw.selectionchange' as any, (e: any) => {
			const id = e.features?.[0]?.id;
			selectId = id === undefined ? null : String(id);
			events.onSelect(selectId);
		});
		map.on('draw.modechange' as any, (e: any) => {
			const m = e.mode as string;
			events.onModeChange(
				m === 'draw_polygon' ? 'draw' : m === 'direct_select' ? 'corners' : 'browse'
			);
		});
	}

	function toFc(facets: readonly PlanFacet[]): FeatureCollection {
		return {
			type: 'FeatureCollection',
			features: facets.map((f) => ({
				type: 'Feature',
				id: f.id,
				properties: { growth: f.growth, label: f.label },
				geometry: f.geometry
			}))
		};
	}

	const api: EditorMap = {
		kind: 'maplibre',
		get drawing() {
			return drawState !== null;
		},
		setFacets(facets, selectedId) {
			facetsNow = facets;
			invalidateSnap();
			if (!draw) {
				(map.getSource('cp-static') as GeoJSONSource).setData(toFc(facets));
				return;
			}
			const keep = new Set(facets.map((f) => f.id));
			const drawingId = drawState?.polygon?.id;
			const gone = draw
				.getAll()
				.features.map((f) => String(f.id))
				.filter((id) => !keep.has(id) && id !== drawingId);
			if (gone.length) draw.delete(gone);
			if (facets.length) draw.add(toFc(facets));
			if (!drawState) {
				const mode = draw.getMode();
				const stillThere = selectedId && keep.has(selectedId);
				if (
					mode === 'direct_select' &&
					directState &&
					stillThere &&
					directState.featureId === selectedId
				) {
					render();
				} else {
					draw.changeMode('simple_select', { featureIds: stillThere ? [selectedId] : [] });
				}
			}
			selectId = selectedId;
		},
		setLabels(list: readonly FacetLabel[]) {
			const seen = new Set<string>();
			for (const l of list) {
				const at = labelPoint(l.geometry);
				seen.add(l.id);
				let m = labels.get(l.id);
				if (!m) {
					const el = document.createElement('div');
					el.className = 'cp-map-label';
					el.setAttribute('aria-hidden', 'true');
					m = new Marker({ element: el }).setLngLat(at).addTo(map);
					labels.set(l.id, m);
				} else m.setLngLat(at);
				const el = m.getElement();
				el.dataset.growth = l.growth;
				el.replaceChildren(textEl('strong', l.text), textEl('span', l.detail));
				labelShapes.set(l.id, l.geometry);
				sizeLabel(l.id);
			}
			for (const [id, m] of labels)
				if (!seen.has(id)) {
					m.remove();
					labels.delete(id);
					labelShapes.delete(id);
				}
		},
		select(id) {
			selectId = id;
			if (!draw || drawState) return;
			if (directState && directState.featureId === id) return;
			draw.changeMode('simple_select', { featureIds: id ? [id] : [] });
		},
		showOutlineSides(sides, onpick) {
			for (const m of sideMarkers.splice(0)) m.remove();
			sides?.forEach((s, i) => {
				sideMarkers.push(
					new Marker({ element: sideButton(s, () => onpick(i)) }).setLngLat(s.at).addTo(map)
				);
			});
		},
		highlightEdge(facetId, segment) {
			for (const m of segmentMarkers.splice(0)) m.remove();
			const f = facetId ? facetsNow.find((x) => x.id === facetId) : undefined;
			const src = map.getSource('cp-edges') as GeoJSONSource;
			if (!f) return src.setData(emptyFc());
			const ring = f.geometry.coordinates[0];
			const features: Feature[] = [];
			for (let i = 0; i < ring.length - 1; i++) {
				const kind = f.edges[i];
				features.push({
					type: 'Feature',
					properties: { kind: kind ?? 'none', highlight: i === segment },
					geometry: { type: 'LineString', coordinates: [ring[i], ring[i + 1]] }
				});
				const el = document.createElement('div');
				el.className = 'cp-seg-number';
				el.textContent = String(i + 1);
				el.setAttribute('aria-hidden', 'true');
				segmentMarkers.push(
					new Marker({ element: el })
						.setLngLat([(ring[i][0] + ring[i + 1][0]) / 2, (ring[i][1] + ring[i + 1][1]) / 2])
						.addTo(map)
				);
			}
			src.setData({ type: 'FeatureCollection', features });
		},
		startDrawing() {
			if (!draw) return;
			draw.changeMode('draw_polygon');
			events.onModeChange('draw');
		},
		finishDrawing() {
			if (!draw || !drawState) return;
			draw.changeMode('simple_select', { featureIds: [drawState.polygon.id] });
		},
		cancelDrawing() {
			if (!draw || !drawState) return;
			const id = drawState.polygon.id;
			drawMode.deleteFeature([id], { silent: true });
			draw.changeMode('simple_select');
			events.onModeChange('browse');
			events.onLive(id, null);
		},
		removeLastCorner() {
			const s = drawState;
			if (!s || s.currentVertexPosition === 0) return false;
			s.polygon.removeCoordinate(`0.${s.currentVertexPosition - 1}`);
			s.currentVertexPosition -= 1;
			render();
			reportLive(s.polygon.id, s.currentVertexPosition >= 3 ? placed(s) : null);
			return true;
		},
		placeCornerAtCentre() {
			if (drawState && drawMode) placeAtCentre(drawMode, drawState);
		},
		editCorners(step) {
			if (!draw) return;
			const id = directState?.featureId ?? selectId;
			if (!id || !draw.get(id)) return;
			const n = (polygonOf(draw.get(id))?.coordinates[0].length ?? 1) - 1;
			let k = 0;
			if (directState && directState.selectedCoordPaths.length) {
				k = Number(String(directState.selectedCoordPaths[0]).split('.')[1]) + (step ?? 0);
			}
			k = ((k % n) + n) % n;
			draw.changeMode('direct_select', { featureId: id, coordPath: `0.${k}` });
			events.onModeChange('corners');
			render();
		},
		nudge(dx, dy) {
			if (!draw) return false;
			const id = directState?.featureId ?? selectId;
			const f = id ? draw.get(id) : undefined;
			const g = polygonOf(f);
			if (!id || !g) return false;
			const corners = g.coordinates[0].slice(0, -1);
			const paths: number[] =
				directState && directState.selectedCoordPaths.length
					? directState.selectedCoordPaths.map((p: string) => Number(p.split('.')[1]))
					: corners.map((_, i) => i);
			const moved = corners.map((c, i) => {
				if (!paths.includes(i)) return c;
				const p = map.project(c as [number, number]);
				const q = map.unproject([p.x + dx, p.y + dy]);
				return [q.lng, q.lat];
			});
			const geometry: Polygon = { type: 'Polygon', coordinates: [closeRing(moved)] };
			draw.add({ type: 'Feature', id, properties: f!.properties ?? {}, geometry });
			render();
			invalidateSnap();
			events.onChange(id, geometry);
			return true;
		},
		deleteSelection() {
			if (!draw) return 'none';
			if (directState && directState.selectedCoordPaths.length) {
				draw.trash();
				return 'corner';
			}
			return selectId ? 'facet' : 'none';
		},
		setSnapping(on) {
			snapping = on;
			if (!on) showSnap(null);
		},
		fitTo(facets) {
			const b = bboxOf(facets);
			if (!b) return;
			map.fitBounds(new LngLatBounds([b[0], b[1]], [b[2], b[3]]), {
				padding: 60,
				maxZoom: 21.5,
				duration: 0
			});
		},
		focus() {
			map.getCanvas().focus();
		},
		destroy() {
			if (window.__clearpitchMap === handle) delete window.__clearpitchMap;
			cancelAnimationFrame(liveFrame);
			map.remove();
		}
	};

	// Browser tests drive the map through its own projection, like a person looking at it.
	const handle: MapTestHandle = {
		kind: 'maplibre',
		project(lonLat) {
			const p = map.project(lonLat);
			const r = container.getBoundingClientRect();
			return { x: r.left + p.x, y: r.top + p.y };
		},
		fitBounds(bbox, paddingPx = 40) {
			return new Promise((resolve) => {
				map.once('idle', () => resolve());
				map.fitBounds(new LngLatBounds([bbox[0], bbox[1]], [bbox[2], bbox[3]]), {
					padding: paddingPx,
					duration: 0,
					maxZoom: MAX_VIEW_ZOOM_256 - 1
				});
				map.triggerRepaint();
			});
		},
		zoom: () => map.getZoom(),
		readyAt
	};
	window.__clearpitchMap = handle;
	return api;
}

function textEl(tag: string, text: string) {
	const el = document.createElement(tag);
	el.textContent = text;
	return el;
}
