/**
 * Snapping a pointer to the corners and edges of neighbouring facets, so facets that share a
 * ridge, hip or valley share its exact positions. Works in screen pixels (what "close" means to
 * the person drawing) and answers in [lon, lat]. Pure: the map's projection is passed in.
 */

export type LonLat = [number, number];
export interface Px {
	x: number;
	y: number;
}
export type Project = (p: LonLat) => Px;

export interface SnapResult {
	kind: 'vertex' | 'edge';
	lonLat: LonLat;
	px: Px;
	distancePx: number;
	facetId: string;
	/** For a vertex: its index in the ring; for an edge: the segment's start index. */
	index: number;
}

interface IndexedRing {
	facetId: string;
	/** Corners without the closing repeat. */
	corners: LonLat[];
	west: number;
	south: number;
	east: number;
	north: number;
}

export interface SnapIndex {
	rings: IndexedRing[];
}

/** Target rings, each a GeoJSON outer ring (closing position repeated or not). */
export function createSnapIndex(
	targets: ReadonlyArray<{ facetId: string; ring: ReadonlyArray<ReadonlyArray<number>> }>
): SnapIndex {
	const rings: IndexedRing[] = [];
	for (const t of targets) {
		const corners: LonLat[] = [];
		for (const p of t.ring) {
			if (p.length >= 2 && Number.isFinite(p[0]) && Number.isFinite(p[1]))
				corners.push([p[0], p[1]]);
		}
		const n = corners.length;
		if (n > 1 && corners[0][0] === corners[n - 1][0] && corners[0][1] === corners[n - 1][1]) {
			corners.pop();
		}
		if (corners.length === 0) continue;
		let west = Infinity,
			south = Infinity,
			east = -Infinity,
			north = -Infinity;
		for (const [x, y] of corners) {
			if (x < west) west = x;
			if (x > east) east = x;
			if (y < south) south = y;
			if (y > north) north = y;
		}
		rings.push({ facetId: t.facetId, corners, west, south, east, north });
	}
	return { rings };
}

/**
 * The nearest corner within `tolerancePx` wins; failing that, the nearest point on an edge.
 * Corners come first even when an edge is nearer, because a shared corner is what makes hips
 * and ridges meet exactly. Returns null when nothing is close enough.
 */
export function snapPoint(
	index: SnapIndex,
	cursor: Px,
	project: Project,
	tolerancePx: number,
	opts: { edges?: boolean } = {}
): SnapResult | null {
	const tol2 = tolerancePx * tolerancePx;
	let best: SnapResult | null = null;
	let bestD2 = tol2;
	let bestEdge: { ring: IndexedRing; i: number; t: number; px: Px } | null = null;
	let bestEdgeD2 = tol2;
	const wantEdges = opts.edges !== false;

	for (const ring of index.rings) {
		// Web Mercator keeps a lon/lat box a screen box, so two projections cull a whole ring.
		const a = project([ring.west, ring.north]);
		const b = project([ring.east, ring.south]);
		const minX = Math.min(a.x, b.x) - tolerancePx;
		const maxX = Math.max(a.x, b.x) + tolerancePx;
		const minY = Math.min(a.y, b.y) - tolerancePx;
		const maxY = Math.max(a.y, b.y) + tolerancePx;
		if (cursor.x < minX || cursor.x > maxX || cursor.y < minY || cursor.y > maxY) continue;

		const n = ring.corners.length;
		const pts: Px[] = new Array(n);
		for (let i = 0; i < n; i++) {
			const p = project(ring.corners[i]);
			pts[i] = p;
			const dx = p.x - cursor.x;
			const dy = p.y - cursor.y;
			const d2 = dx * dx + dy * dy;
			if (d2 <= bestD2) {
				bestD2 = d2;
				best = {
					kind: 'vertex',
					lonLat: [ring.corners[i][0], ring.corners[i][1]],
					px: p,
					distancePx: Math.sqrt(d2),
					facetId: ring.facetId,
					index: i
				};
			}
		}
		if (!wantEdges || n < 2) continue;
		for (let i = 0; i < n; i++) {
			const p = pts[i];
			const q = pts[(i + 1) % n];
			const ex = q.x - p.x;
			const ey = q.y - p.y;
			const len2 = ex * ex + ey * ey;
			if (len2 === 0) continue;
			let t = ((cursor.x - p.x) * ex + (cursor.y - p.y) * ey) / len2;
			t = t < 0 ? 0 : t > 1 ? 1 : t;
			const x = p.x + t * ex;
			const y = p.y + t * ey;
			const dx = x - cursor.x;
			const dy = y - cursor.y;
			const d2 = dx * dx + dy * dy;
			if (d2 <= bestEdgeD2) {
				bestEdgeD2 = d2;
				bestEdge = { ring, i, t, px: { x, y } };
			}
		}
	}
	if (best) return best;
	if (!bestEdge) return null;
	const { ring, i, t, px } = bestEdge;
	const p = ring.corners[i];
	const q = ring.corners[(i + 1) % ring.corners.length];
	// Linear in lon/lat matches linear in Mercator pixels to well under a millimetre over a roof.
	return {
		kind: 'edge',
		lonLat: [p[0] + t * (q[0] - p[0]), p[1] + t * (q[1] - p[1])],
		px,
		distancePx: Math.sqrt(bestEdgeD2),
		facetId: ring.facetId,
		index: i
	};
}

/** Pixels of snap reach: a fingertip needs more room than a mouse pointer. */
export function snapTolerancePx(pointer: 'mouse' | 'pen' | 'touch'): number {
	return pointer === 'touch' ? 18 : pointer === 'pen' ? 12 : 10;
}
