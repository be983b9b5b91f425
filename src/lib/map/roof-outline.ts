import type { Position } from 'geojson';
import { facetsFromFootprint, type RoofForm } from '../estimating/footprint';
import { planeForRing } from '../estimating/local-plane';
import { squareCorners } from '../estimating/square-corners';
import { M_PER_FT } from '../estimating/units';
import type { PlanFacet } from '../schemas/roof-plan';
import type { OutlineSideMark } from './editor-map';

/** What the estimator chose for a traced outline. */
export interface OutlineChoices {
	form: RoofForm;
	/** One pitch for every slope … */
	pitch: number;
	/** … or, when set, one per side (ring order). */
	sidePitches: number[] | null;
	/** Sides (0-based) chosen as gable ends. */
	gableSides: number[];
	overhangM: number;
	square: boolean;
}

export interface OutlineSide {
	lengthFt: number;
	/** The way the side faces, outwards: north, north-east, … */
	facing: string;
}

const FACING = [
	'north',
	'north-east',
	'east',
	'south-east',
	'south',
	'south-west',
	'west',
	'north-west'
];

/** The outline's sides as the panel lists them, so "the east side" can be chosen as a gable. */
export function outlineSides(ring: Position[]): OutlineSide[] {
	const plane = planeForRing(ring);
	const pts = ring.map((p) => plane.toXY(p));
	let twice = 0;
	for (let i = 0; i < pts.length - 1; i++) {
		twice += pts[i][0] * pts[i + 1][1] - pts[i + 1][0] * pts[i][1];
	}
	const ccw = twice > 0;
	return pts.slice(0, -1).map((p, i) => {
		const q = pts[i + 1];
		const dx = q[0] - p[0];
		const dy = q[1] - p[1];
		// Outward normal: right of the direction of travel on a counter-clockwise ring.
		const [nx, ny] = ccw ? [dy, -dx] : [-dy, dx];
		const az = ((Math.atan2(nx, ny) * 180) / Math.PI + 360) % 360;
		return { lengthFt: Math.hypot(dx, dy) / M_PER_FT, facing: FACING[Math.round(az / 45) % 8] };
	});
}

export type OutlineRoof =
	| { ok: true; ring: Position[]; facets: OutlineFacet[] }
	| { ok: false; field: string; message: string };

export type OutlineFacet = Pick<PlanFacet, 'id' | 'label' | 'geometry' | 'pitch' | 'edges'>;

/**
 * The facets for a traced outline and the choices made for it, with ids from `idPrefix`
 * (unique per outline, so facets made again replace their own group only).
 */
export function roofFromOutline(
	traced: Position[],
	c: OutlineChoices,
	idPrefix: string
): OutlineRoof {
	const ring = workingRing(traced, c);
	const r = facetsFromFootprint({
		ring,
		form: c.form,
		pitch: c.sidePitches ?? c.pitch,
		gableEdges: c.form === 'gable' ? c.gableSides : [],
		overhangM: c.overhangM
	});
	if (!r.ok) return r;
	return {
		ok: true,
		ring,
		facets: r.facets.map((f, i) => ({
			id: `${idPrefix}-${i + 1}`,
			label: f.label,
			geometry: f.geometry,
			pitch: f.pitch,
			edges: f.edges
		}))
	};
}

/** The choices a new outline starts with: a hip at the pitch the estimator last used. */
export function firstChoices(pitch: number, sides: number): OutlineChoices {
	return {
		form: 'hip',
		pitch: pitch > 0 ? pitch : 6,
		sidePitches: null,
		gableSides: [],
		overhangM: 0,
		square: sides >= 4
	};
}

/** The ring the facets are made from: squared when asked. */
export function workingRing(traced: Position[], c: OutlineChoices): Position[] {
	return c.square ? squareCorners(traced) : traced;
}

/** The map's side buttons: one per side at its middle, pressed where it is a gable end. */
export function sideMarks(traced: Position[], c: OutlineChoices): OutlineSideMark[] {
	if (c.form === 'flat') return [];
	const ring = workingRing(traced, c);
	return ring.slice(0, -1).map((p, i) => {
		const q = ring[i + 1];
		const gable = c.form === 'gable' && c.gableSides.includes(i);
		return {
			at: [(p[0] + q[0]) / 2, (p[1] + q[1]) / 2],
			text: gable ? `${i + 1} · gable` : String(i + 1),
			label: `Side ${i + 1} ends in a gable`,
			pressed: gable
		};
	});
}

/** Tapping a side: it becomes a gable end (a hip roof turns gable), or stops being one. */
export function pickSide(c: OutlineChoices, side: number): OutlineChoices {
	if (c.form !== 'gable') return { ...c, form: 'gable', gableSides: [side] };
	const on = c.gableSides.includes(side);
	return {
		...c,
		gableSides: on
			? c.gableSides.filter((g) => g !== side)
			: [...c.gableSides, side].sort((a, b) => a - b)
	};
}
