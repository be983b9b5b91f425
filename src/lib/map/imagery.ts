/** The raster under every map: the owner's licensed XYZ source, or the bundled sample. */
export interface Imagery {
	sample: boolean;
	/** XYZ template with {z}/{x}/{y}. */
	tiles: string;
	attribution: string;
	/** Zooms the source serves, counted in 256-px tiles. */
	minZoom: number;
	maxZoom: number;
	/** [west, south, east, north]; null when the source covers the world. */
	bounds: [number, number, number, number] | null;
}

/** Deepest zoom any of our maps allows: past the imagery, tiles are enlarged. */
export const MAX_VIEW_ZOOM_256 = 23;

export const GROWTH_COLOURS = {
	G0: '#e6efe9',
	G1: '#cfe0c3',
	G2: '#d9c58a',
	G3: '#b9825a',
	G4: '#6f4a3a'
} as const;

export const GROWTH_LABELS = {
	G0: 'G0 clean',
	G1: 'G1 light',
	G2: 'G2 moderate',
	G3: 'G3 heavy',
	G4: 'G4 severe'
} as const;

export const ACCESS_LABELS = {
	ground: 'Ground',
	ladder: 'Ladder',
	roof: 'Roof',
	lift: 'Lift'
} as const;

export const MATERIAL_LABELS = {
	asphalt_shingle: 'Asphalt shingle',
	clay_tile: 'Clay tile',
	concrete_tile: 'Concrete tile',
	metal: 'Metal',
	slate: 'Slate',
	wood_shake: 'Wood shake'
} as const;

export const EDGE_LABELS = {
	eave: 'Eave',
	rake: 'Rake',
	ridge: 'Ridge',
	hip: 'Hip',
	valley: 'Valley'
} as const;

/** Line colours for labelled edges on the map; each also has its own dash so colour isn't alone. */
export const EDGE_STYLES = {
	eave: { colour: '#1f4d3a', dash: null },
	rake: { colour: '#2f7556', dash: [3, 2] },
	ridge: { colour: '#a45530', dash: null },
	hip: { colour: '#c0693f', dash: [1, 1.5] },
	valley: { colour: '#1b4f8a', dash: [4, 1.5, 1, 1.5] }
} as const;
