import type { Polygon, Position } from 'geojson';
import { labelPoint } from '../map/label-point';
import type { EdgeKind } from '../estimating/types';

/** Mean Earth radius (IUGG), m: plenty for a picture a few dozen metres across. */
const R = 6_371_008.8;
const M_PER_FT = 0.3048;

export interface PictureFacetIn {
	id: string;
	geometry: Polygon;
	edges?: ReadonlyArray<EdgeKind | null>;
	access: string;
	/** The model's placement count for this facet (0 unless it is worked from a ladder). */
	ladderPlacements: number;
	growth: string;
}

export interface PictureFacet {
	id: string;
	n: number;
	growth: string;
	/** SVG `points`, in feet on the page (x east, y south). */
	points: string;
	label: { x: number; y: number };
	/** Eave segments, for drawing them heavier. */
	eaves: { x1: number; y1: number; x2: number; y2: number }[];
}

export interface LadderSpot {
	facetId: string;
	n: number;
	x: number;
	y: number;
}

export interface PlanPicture {
	viewBox: string;
	widthFt: number;
	heightFt: number;
	facets: PictureFacet[];
	ladders: LadderSpot[];
}

type Pt = { x: number; y: number };

/**
 * A top-down picture of the roof plan for the crew sheet: facets numbered in plan order, eaves
 * marked, ladder placements spread evenly along the eaves of ladder-only facets. Positions are
 * on a local plane around the plan's centre (east and north distances in feet), which is exact
 * enough for a sketch; it is drawn as SVG so it prints and needs no imagery offline.
 */
export function planPicture(facets: readonly PictureFacetIn[], padFt = 6): PlanPicture {
	const all = facets.flatMap((f) => f.geometry.coordinates[0]);
	const lon0 = all.reduce((s, p) => s + p[0], 0) / Math.max(1, all.length);
	const lat0 = all.reduce((s, p) => s + p[1], 0) / Math.max(1, all.length);
	const k = (Math.PI / 180) * (R / M_PER_FT);
	const project = (p: Position): Pt => ({
		x: (p[0] - lon0) * k * Math.cos((lat0 * Math.PI) / 180),
		y: -(p[1] - lat0) * k
	});

	const projected = facets.map((f) => f.geometry.coordinates[0].map(project));
	const xs = projected.flat().map((p) => p.x);
	const ys = projected.flat().map((p) => p.y);
	const minX = Math.min(...xs, 0) - padFt;
	const minY = Math.min(...ys, 0) - padFt;
	const w = Math.max(...xs, 0) + padFt - minX;
	const h = Math.max(...ys, 0) + padFt - minY;

	const out: PictureFacet[] = [];
	const ladders: LadderSpot[] = [];
	facets.forEach((f, i) => {
		const ring = projected[i];
		const segs = eaveSegments(ring, f.edges);
		const lp = project(labelPoint(f.geometry));
		out.push({
			id: f.id,
			n: i + 1,
			growth: f.growth,
			points: ring
				.slice(0, -1)
				.map((p) => `${round(p.x)},${round(p.y)}`)
				.join(' '),
			label: { x: round(lp.x), y: round(lp.y) },
			eaves: segs.map(([a, b]) => ({
				x1: round(a.x),
				y1: round(a.y),
				x2: round(b.x),
				y2: round(b.y)
			}))
		});
		if (f.access === 'ladder' && f.ladderPlacements > 0) {
			spreadAlong(segs, f.ladderPlacements).forEach((p, j) =>
				ladders.push({ facetId: f.id, n: j + 1, x: round(p.x), y: round(p.y) })
			);
		}
	});
	return {
		viewBox: `${round(minX)} ${round(minY)} ${round(w)} ${round(h)}`,
		widthFt: w,
		heightFt: h,
		facets: out,
		ladders
	};
}

const round = (v: number) => Math.round(v * 100) / 100;

/**
 * The eave segments of a ring, by the same rule the model measures eave length with: the
 * labelled eaves, or the longest unlabelled segment when none is labelled.
 */
export function eaveSegments(
	ring: readonly Pt[],
	edges: ReadonlyArray<EdgeKind | null> | undefined
): [Pt, Pt][] {
	const segs: [Pt, Pt][] = [];
	for (let i = 0; i + 1 < ring.length; i++) segs.push([ring[i], ring[i + 1]]);
	const labelled = segs.filter((_, i) => edges?.[i] === 'eave');
	if (labelled.length) return labelled;
	const unlabelled = segs.filter((_, i) => edges?.[i] == null);
	if (!unlabelled.length) return [];
	return [unlabelled.reduce((a, b) => (len(b) > len(a) ? b : a))];
}

const len = ([a, b]: [Pt, Pt]) => Math.hypot(b.x - a.x, b.y - a.y);

/** `n` points evenly spaced along a chain of segments, each in the middle of its share. */
export function spreadAlong(segs: readonly [Pt, Pt][], n: number): Pt[] {
	const total = segs.reduce((s, g) => s + len(g), 0);
	if (total === 0 || n < 1) return [];
	const out: Pt[] = [];
	for (let i = 0; i < n; i++) {
		let d = ((i + 0.5) * total) / n;
		for (const g of segs) {
			const l = len(g);
			if (d <= l || g === segs[segs.length - 1]) {
				const t = l === 0 ? 0 : Math.min(1, d / l);
				out.push({ x: g[0].x + (g[1].x - g[0].x) * t, y: g[0].y + (g[1].y - g[0].y) * t });
				break;
			}
			d -= l;
		}
	}
	return out;
}
