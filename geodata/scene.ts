/**
 * Typed read access to geodata/scene.geojson, the invented Wrenfield neighbourhood whose roofs
 * are known exactly. Plain Node (fs), no DOM, so scripts, tests and server code can all use it.
 */
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export type Edge = 'eave' | 'rake' | 'ridge' | 'hip' | 'valley';
export type Material =
	'asphalt_shingle' | 'clay_tile' | 'concrete_tile' | 'metal' | 'slate' | 'wood_shake';
export type Growth = 'G0' | 'G1' | 'G2' | 'G3' | 'G4';
export type Access = 'ground' | 'ladder' | 'roof' | 'lift';
export type Section = 'main' | 'wing' | 'garage' | 'porch' | 'dormer';
export type Position = [number, number];

export interface HouseProps {
	kind: 'house';
	houseId: string;
	address: string;
	street: string;
	town: string;
	customer: string;
	lat: number;
	lon: number;
	roofType: string;
	materials: Material[];
	stories: number;
	noGutters: boolean;
	facetCount: number;
	/** Truth: Σ facet plan (top-down) area, ft², from GeographicLib. */
	planAreaFt2: number;
	/** Truth: Σ facet sloped area, ft². */
	slopedAreaFt2: number;
	squares: number;
	eaveLengthFt: number;
	notes: string;
}

export interface FacetProps {
	kind: 'facet';
	houseId: string;
	facetId: string;
	label: string;
	section: Section;
	/** Rise in inches per 12 in of run. */
	pitch: number;
	material: Material;
	growth: Growth;
	access: Access;
	stories: number;
	/** One per ring segment, in ring order. */
	edges: Edge[];
	/** Base colour the imagery gives this facet. */
	shade: string;
	eaveHeightM: number;
	/** Compass bearing the facet drains towards, degrees clockwise from north. */
	downslopeAzimuthDeg: number;
	planAreaM2: number;
	planAreaFt2: number;
	/** planAreaFt2 × √(1 + (pitch/12)²). */
	slopedAreaFt2: number;
	eaveLengthFt: number;
	notes?: string;
}

export interface StreetProps {
	kind: 'street';
	name: string;
	widthM: number;
	sidewalkM: number;
	vergeM: number;
}
export interface ParcelProps {
	kind: 'parcel';
	houseId: string;
	lawn: string;
}
export interface LawnProps {
	kind: 'lawn';
	name: string;
	lawn: string;
}
export interface DrivewayProps {
	kind: 'driveway';
	houseId: string;
	surface: 'concrete' | 'asphalt' | 'pavers';
}
export interface PoolProps {
	kind: 'pool';
	houseId: string;
	deckM: number;
}
export interface FenceProps {
	kind: 'fence';
	houseId: string;
	heightM: number;
	style: 'wood' | 'vinyl';
}
export interface ShrubProps {
	kind: 'shrub';
	shrubId: string;
	radiusM: number;
	houseId?: string;
}
export interface TreeProps {
	kind: 'tree';
	treeId: string;
	crownRadiusM: number;
	heightM: number;
	form: 'broadleaf' | 'conifer';
	/** The house whose roof this crown reaches over, if any. */
	overhangs?: string;
}

interface F<P, G> {
	type: 'Feature';
	properties: P;
	geometry: G;
}
type PointG = { type: 'Point'; coordinates: Position };
type LineG = { type: 'LineString'; coordinates: Position[] };
type PolyG = { type: 'Polygon'; coordinates: Position[][] };

export type HouseFeature = F<HouseProps, PointG>;
export type FacetFeature = F<FacetProps, PolyG>;
export type StreetFeature = F<StreetProps, LineG>;
export type ParcelFeature = F<ParcelProps, PolyG>;
export type LawnFeature = F<LawnProps, PolyG>;
export type DrivewayFeature = F<DrivewayProps, PolyG>;
export type PoolFeature = F<PoolProps, PolyG>;
export type FenceFeature = F<FenceProps, LineG>;
export type ShrubFeature = F<ShrubProps, PointG>;
export type TreeFeature = F<TreeProps, PointG>;
export type SceneFeature =
	| HouseFeature
	| FacetFeature
	| StreetFeature
	| ParcelFeature
	| LawnFeature
	| DrivewayFeature
	| PoolFeature
	| FenceFeature
	| ShrubFeature
	| TreeFeature;
export type SceneKind = SceneFeature['properties']['kind'];

export interface Scene {
	type: 'FeatureCollection';
	name: string;
	/** [lon, lat] the neighbourhood is laid out around. */
	origin: Position;
	/** [west, south, east, north] of everything but the (deliberately long) streets. */
	bbox: [number, number, number, number];
	features: SceneFeature[];
}

/**
 * Beside this file, or, for bundled code that no longer sits next to it, in the working directory
 * (the repo root for npm scripts). The scene is demo and test data: nothing here reads the
 * environment, and the product's own code does not load it.
 */
export function scenePath(): string {
	const candidates = [
		fileURLToPath(new URL('./scene.geojson', import.meta.url)),
		path.resolve(process.cwd(), 'geodata/scene.geojson')
	];
	const found = candidates.find((p) => existsSync(p));
	if (!found) throw new Error(`scene.geojson not found (looked in ${candidates.join(', ')})`);
	return found;
}

let cached: Scene | undefined;

/** The parsed scene, read once per process. */
export function loadScene(): Scene {
	cached ??= JSON.parse(readFileSync(scenePath(), 'utf8')) as Scene;
	return cached;
}

export function featuresOf<K extends SceneKind>(
	kind: K
): Extract<SceneFeature, { properties: { kind: K } }>[] {
	return loadScene().features.filter(
		(f): f is Extract<SceneFeature, { properties: { kind: K } }> => f.properties.kind === kind
	);
}

export function houses(): HouseFeature[] {
	return featuresOf('house');
}

export function house(houseId: string): HouseFeature | undefined {
	return houses().find((h) => h.properties.houseId === houseId);
}

export function facetsOf(houseId: string): FacetFeature[] {
	return featuresOf('facet').filter((f) => f.properties.houseId === houseId);
}

/** [west, south, east, north] in degrees. */
export function sceneBounds(): [number, number, number, number] {
	return loadScene().bbox;
}

/** A house's facets as a roof plan lists them (the shape /api/roof-plans takes). */
export function planFacetsOf(houseId: string) {
	return facetsOf(houseId).map(({ properties: p, geometry }) => ({
		id: p.facetId,
		label: p.label,
		geometry,
		pitch: p.pitch,
		material: p.material,
		growth: p.growth,
		access: p.access,
		stories: p.stories,
		edges: p.edges
	}));
}

/** The same facets as the estimating model and /api/estimates take them (stories checked to be 1–3). */
export function estimateFacetsOf(houseId: string) {
	return planFacetsOf(houseId).map(({ geometry, stories, ...f }) => {
		if (stories !== 1 && stories !== 2 && stories !== 3) {
			throw new Error(`scene facet ${f.id} has ${stories} stories; the model takes 1 to 3`);
		}
		return { ...f, geometry, stories: stories as 1 | 2 | 3 };
	});
}
