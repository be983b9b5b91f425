/**
 * Roof facets from a building's outline: the roof form, the pitch and the overhang give every
 * plane of a hip, gable or low flat roof, with its edges named (eave, ridge, hip, valley, rake).
 *
 * A roof whose eaves are level and whose planes all rise at the same pitch is the straight
 * skeleton of its outline: each eave's plane is the region that drains to it, and the skeleton's
 * arcs are the hips, valleys and ridges (Aichholzer, Aurenhammer, Alberts & Gärtner, "A novel
 * type of skeleton for polygons", J. UCS 1(12), 1995). The skeleton comes from the
 * `straight-skeleton` package; everything after it (gable ends, a pitch per eave, coplanar
 * merging, edge names) is done here in a local metric plane.
 */
import type { Polygon, Position } from 'geojson';
import { SkeletonBuilder } from 'straight-skeleton';
import { measureFacetPlan } from './geometry';
import { planeForRing, type LocalPlane } from './local-plane';
import { MAX_PITCH_RISE, type EdgeKind } from './types';

export const ROOF_FORMS = ['hip', 'gable', 'flat'] as const;
export type RoofForm = (typeof ROOF_FORMS)[number];

export const FOOTPRINT_LIMITS = {
	maxCorners: 60,
	/** More than any eave overhang; more usually means the outline is already the roof edge. */
	maxOverhangM: 3
} as const;

export interface FootprintInput {
	/** Closed ring of [lon, lat] (the last position repeats the first). */
	ring: Position[];
	form: RoofForm;
	/** Rise per 12: one for every plane, or one per ring segment in ring order. */
	pitch: number | readonly number[];
	/** Segments (0-based, ring order) that end in a gable; 'gable' needs at least one. */
	gableEdges?: readonly number[];
	/** How far the roof reaches past the outline on every side, m (0: the outline is the roof edge). */
	overhangM?: number;
}

/** A generated plane, ready to become an editor facet (the editor adds id, material, grades). */
export interface FootprintFacet {
	label: string;
	geometry: Polygon;
	pitch: number;
	edges: EdgeKind[];
	/** Compass bearing the plane drains towards, degrees clockwise from north. */
	downslopeDeg: number;
}

export type FootprintResult =
	| { ok: true; facets: FootprintFacet[] }
	| { ok: false; field: 'ring' | 'form' | 'pitch' | 'gableEdges' | 'overhangM'; message: string };

type XY = [number, number];

interface Side {
	/** Corner indices in the working outline: this side runs from corner `a` to corner `a + 1`. */
	a: number;
	/** The user's segment numbers this side stands for (collinear segments merge). */
	segments: number[];
	t: number;
	gable: boolean;
	/** Inward unit normal and a point on the line. */
	n: XY;
	q: XY;
}

interface Node {
	x: number;
	y: number;
	corner: boolean;
}

interface Face {
	/** The sides draining into this plane (more than one after coplanar sides merge). */
	sides: number[];
	nodes: number[];
}

const fail = (field: Extract<FootprintResult, { ok: false }>['field'], message: string) =>
	({ ok: false, field, message }) as const;

/** Facets for the outline, or the reason there are none (naming the segment, 1-based). */
export function facetsFromFootprint(input: FootprintInput): FootprintResult {
	if (!ROOF_FORMS.includes(input.form)) {
		return fail('form', `roof form must be one of: ${ROOF_FORMS.join(', ')}`);
	}
	const ring = input.ring;
	const plan = measureFacetPlan({ type: 'Polygon', coordinates: [ring] });
	if (!plan.ok) return fail('ring', plan.issues[0].message);
	const segCount = ring.length - 1;
	if (segCount > FOOTPRINT_LIMITS.maxCorners) {
		return fail('ring', `the outline may have at most ${FOOTPRINT_LIMITS.maxCorners} corners`);
	}

	const pitches = Array.isArray(input.pitch)
		? (input.pitch as readonly number[])
		: new Array<number>(segCount).fill(input.pitch as number);
	if (pitches.length !== segCount) {
		return fail(
			'pitch',
			`give one pitch, or one per side: ${segCount} expected, ${pitches.length} given`
		);
	}
	const minPitch = input.form === 'flat' ? 0 : Number.MIN_VALUE;
	for (let i = 0; i < segCount; i++) {
		const p = pitches[i];
		if (typeof p !== 'number' || !Number.isFinite(p) || p < minPitch || p > MAX_PITCH_RISE) {
			return fail(
				'pitch',
				input.form === 'flat'
					? `pitch of side ${i + 1} must be between 0 and ${MAX_PITCH_RISE}`
					: `pitch of side ${i + 1} must be above 0 and at most ${MAX_PITCH_RISE} (a sloped roof needs a rise)`
			);
		}
	}

	const gables = new Set<number>();
	for (const g of input.gableEdges ?? []) {
		if (!Number.isInteger(g) || g < 0 || g >= segCount) {
			return fail(
				'gableEdges',
				`gable end ${JSON.stringify(g)} is not a side of the outline (1 to ${segCount})`
			);
		}
		gables.add(g);
	}
	if (input.form === 'gable' && gables.size === 0) {
		return fail('gableEdges', 'a gable roof needs at least one side chosen as a gable end');
	}
	if (input.form !== 'gable') gables.clear();

	const overhang = input.overhangM ?? 0;
	if (
		typeof overhang !== 'number' ||
		!Number.isFinite(overhang) ||
		overhang < 0 ||
		overhang > FOOTPRINT_LIMITS.maxOverhangM
	) {
		return fail('overhangM', `overhang must be between 0 and ${FOOTPRINT_LIMITS.maxOverhangM} m`);
	}

	const local = planeForRing(ring);
	const outline = workingOutline(ring, local, pitches, gables);
	if (overhang > 0) offsetOutward(outline.corners, outline.sides, overhang);

	const out =
		input.form === 'flat'
			? flatRoof(outline.corners, pitches[0], outline.sides)
			: slopedRoof(outline.corners, outline.sides);
	if (!out.ok) return out;

	const facets = out.faces.map((f) => toFacet(f, local));
	labelFacets(facets);
	for (let i = 0; i < facets.length; i++) {
		const check = measureFacetPlan(facets[i].geometry);
		if (!check.ok) {
			return fail(
				'ring',
				`the roof planes from this outline do not close up (${facets[i].label}: ${check.issues[0].message}); try the hip form and correct by hand`
			);
		}
	}
	return { ok: true, facets };
}

// ---------------------------------------------------------------------------------------------
// The outline in metres

/**
 * Counter-clockwise corners in metres, with repeated corners dropped and a corner that lies on a
 * straight run merged away (the skeleton would otherwise grow a sliver of a plane there) when
 * both sides have the same pitch and gable choice.
 */
function workingOutline(
	ring: Position[],
	local: LocalPlane,
	pitches: readonly number[],
	gables: ReadonlySet<number>
): { corners: XY[]; sides: Side[] } {
	const m = ring.length - 1;
	let pts: XY[] = [];
	let segs: number[][] = [];
	for (let i = 0; i < m; i++) {
		const p = local.toXY(ring[i]);
		const prev = pts.at(-1);
		if (prev && Math.hypot(p[0] - prev[0], p[1] - prev[1]) < 1e-6) {
			segs[segs.length - 1].push(i);
			continue;
		}
		pts.push(p);
		segs.push([i]);
	}
	if (pts.length > 1 && Math.hypot(pts[0][0] - pts.at(-1)![0], pts[0][1] - pts.at(-1)![1]) < 1e-6) {
		segs[segs.length - 2].push(...segs.pop()!);
		pts.pop();
	}
	if (signedArea(pts) < 0) {
		// Reversed, side k runs from old corner k+1 to old corner k: it is old side k in reverse.
		const n = pts.length;
		const rp: XY[] = [];
		const rs: number[][] = [];
		for (let k = 0; k < n; k++) {
			rp.push(pts[(n - k) % n]);
			rs.push(segs[(n - k - 1 + n) % n]);
		}
		pts = rp;
		segs = rs;
	}
	// A gable end is a wall: the pitch given for it plays no part.
	const key = (s: number[]) => (gables.has(s[0]) ? 'gable' : `${pitches[s[0]]}`);
	let merged = true;
	while (merged && pts.length > 3) {
		merged = false;
		for (let i = 0; i < pts.length; i++) {
			const n = pts.length;
			const a = pts[(i - 1 + n) % n];
			const b = pts[i];
			const c = pts[(i + 1) % n];
			const l1 = Math.hypot(b[0] - a[0], b[1] - a[1]);
			const l2 = Math.hypot(c[0] - b[0], c[1] - b[1]);
			const cross = (b[0] - a[0]) * (c[1] - b[1]) - (b[1] - a[1]) * (c[0] - b[0]);
			const dot = (b[0] - a[0]) * (c[0] - b[0]) + (b[1] - a[1]) * (c[1] - b[1]);
			const before = segs[(i - 1 + n) % n];
			const after = segs[i];
			if (dot > 0 && Math.abs(cross) < 1e-4 * l1 * l2 && key(before) === key(after)) {
				before.push(...after);
				pts.splice(i, 1);
				segs.splice(i, 1);
				merged = true;
				break;
			}
		}
	}
	const sides = pts.map((_, k): Side => {
		const s = segs[k];
		return {
			a: k,
			segments: s,
			t: pitches[s[0]] / 12,
			gable: s.some((g) => gables.has(g)),
			n: [0, 0],
			q: [0, 0]
		};
	});
	setLines(pts, sides);
	return { corners: pts, sides };
}

function setLines(corners: XY[], sides: Side[]) {
	const n = corners.length;
	for (const s of sides) {
		const p = corners[s.a];
		const r = corners[(s.a + 1) % n];
		const len = Math.hypot(r[0] - p[0], r[1] - p[1]);
		// Counter-clockwise outline: the inside is to the left of each side.
		s.n = [-(r[1] - p[1]) / len, (r[0] - p[0]) / len];
		s.q = [p[0], p[1]];
	}
}

function signedArea(p: XY[]): number {
	let s = 0;
	for (let i = 0; i < p.length; i++) {
		const a = p[i];
		const b = p[(i + 1) % p.length];
		s += a[0] * b[1] - b[0] * a[1];
	}
	return s / 2;
}

/** Moves every side out by d (the eave line is the wall line plus the overhang). */
function offsetOutward(corners: XY[], sides: Side[], d: number) {
	const n = corners.length;
	const lines = sides.map((s) => ({ n: s.n, c: s.n[0] * s.q[0] + s.n[1] * s.q[1] - d }));
	for (let k = 0; k < n; k++) {
		const l1 = lines[(k - 1 + n) % n];
		const l2 = lines[k];
		const det = l1.n[0] * l2.n[1] - l1.n[1] * l2.n[0];
		// Parallel neighbours (a straight run) cannot happen after merging; guard anyway.
		if (Math.abs(det) < 1e-12) {
			corners[k] = [corners[k][0] - l2.n[0] * d, corners[k][1] - l2.n[1] * d];
			continue;
		}
		corners[k] = [(l1.c * l2.n[1] - l2.c * l1.n[1]) / det, (l1.n[0] * l2.c - l2.n[0] * l1.c) / det];
	}
	setLines(corners, sides);
}

// ---------------------------------------------------------------------------------------------
// Roofs

type Built = { ok: true; faces: BuiltFace[] } | Extract<FootprintResult, { ok: false }>;

interface BuiltFace {
	ring: XY[];
	edges: EdgeKind[];
	pitch: number;
	side: Side;
}

function flatRoof(corners: XY[], pitch: number, sides: Side[]): Built {
	return {
		ok: true,
		faces: [
			{
				ring: corners.map((c) => [c[0], c[1]]),
				edges: corners.map(() => 'eave'),
				pitch,
				side: sides[0]
			}
		]
	};
}

const height = (s: Side, p: XY) => s.t * (s.n[0] * (p[0] - s.q[0]) + s.n[1] * (p[1] - s.q[1]));
const distTo = (s: Side, p: XY) => s.n[0] * (p[0] - s.q[0]) + s.n[1] * (p[1] - s.q[1]);

function slopedRoof(corners: XY[], sides: Side[]): Built {
	const n = corners.length;
	let skeleton;
	try {
		skeleton = SkeletonBuilder.BuildFromGeoJSON([
			[corners.map((c) => [c[0], c[1]] as [number, number])]
		]);
	} catch (e) {
		return fail(
			'ring',
			`the outline could not be split into roof planes (${(e as Error).message}); check it for crossing or nearly touching sides`
		);
	}

	// Skeleton points become shared nodes, so neighbouring planes keep the very same corners.
	const nodes: Node[] = corners.map((c) => ({ x: c[0], y: c[1], corner: true }));
	const scale = Math.max(...corners.map((c) => Math.hypot(c[0], c[1])), 1);
	const tol = 1e-7 * scale;
	const nodeAt = (x: number, y: number): number => {
		for (let i = 0; i < nodes.length; i++) {
			if (Math.abs(nodes[i].x - x) <= tol && Math.abs(nodes[i].y - y) <= tol) return i;
		}
		nodes.push({ x, y, corner: false });
		return nodes.length - 1;
	};

	const faces: Face[] = [];
	for (const er of skeleton.Edges) {
		const a = nodeAt(er.Edge.Begin.X, er.Edge.Begin.Y);
		const b = nodeAt(er.Edge.End.X, er.Edge.End.Y);
		const side = sides.findIndex((s) => s.a === a && (s.a + 1) % n === b);
		if (side < 0) return fail('ring', 'the outline could not be split into roof planes; redraw it');
		const ids: number[] = [];
		for (const p of er.Polygon) {
			const id = nodeAt(p.X, p.Y);
			if (ids.at(-1) !== id) ids.push(id);
		}
		if (ids.length > 1 && ids[0] === ids.at(-1)) ids.pop();
		if (signedArea(ids.map((i) => [nodes[i].x, nodes[i].y])) < 0) ids.reverse();
		const start = ids.findIndex((id, k) => id === a && ids[(k + 1) % ids.length] === b);
		if (start < 0)
			return fail('ring', 'the outline could not be split into roof planes; redraw it');
		faces.push({ sides: [side], nodes: [...ids.slice(start), ...ids.slice(0, start)] });
	}
	if (faces.length !== n)
		return fail('ring', 'the outline could not be split into roof planes; redraw it');

	// A gable end is a vertical wall: its side's plane goes, and the peak it rose to moves out onto
	// the wall line, so the neighbouring planes run to the wall and end there in rakes.
	const onGable = new Map<number, number>();
	for (let f = faces.length - 1; f >= 0; f--) {
		const side = faces[f].sides[0];
		if (!sides[side].gable) continue;
		const inner = faces[f].nodes.filter((id) => !nodes[id].corner);
		const label = sides[side].segments.map((s) => s + 1).join('+');
		if (inner.length !== 1) {
			return fail(
				'gableEdges',
				`side ${label} cannot end in a gable: its slope reaches the ridge along its length (gable ends go on the short sides)`
			);
		}
		if (onGable.has(inner[0])) {
			return fail(
				'gableEdges',
				`sides ${sides[onGable.get(inner[0])!].segments[0] + 1} and ${label} rise to the same peak, so both cannot be gable ends; make one a hip`
			);
		}
		onGable.set(inner[0], side);
		faces.splice(f, 1);
	}

	// Each inner node sits where the planes that meet there are at the same height, and on the
	// wall line of its gable: the skeleton's point when every pitch is the same, the right one
	// when the pitches differ (the planes keep the skeleton's layout).
	for (let id = 0; id < nodes.length; id++) {
		if (nodes[id].corner) continue;
		const around = faces.filter((f) => f.nodes.includes(id)).map((f) => sides[f.sides[0]]);
		const rows: Array<[number, number, number]> = [];
		for (let k = 1; k < around.length; k++) {
			const si = around[0];
			const sj = around[k];
			rows.push([
				si.t * si.n[0] - sj.t * sj.n[0],
				si.t * si.n[1] - sj.t * sj.n[1],
				si.t * (si.n[0] * si.q[0] + si.n[1] * si.q[1]) -
					sj.t * (sj.n[0] * sj.q[0] + sj.n[1] * sj.q[1])
			]);
		}
		const g = onGable.get(id);
		if (g !== undefined) {
			const s = sides[g];
			// Weighted well above the others: the peak must lie on the wall, not near it.
			const w = 1e3;
			rows.push([w * s.n[0], w * s.n[1], w * (s.n[0] * s.q[0] + s.n[1] * s.q[1])]);
		}
		const p = leastSquares(rows);
		if (p) {
			nodes[id].x = p[0];
			nodes[id].y = p[1];
		}
	}

	// Planes of sides on one line with one pitch are one plane (an outline with a notch).
	tidy(faces, nodes, 1e-6 * scale);
	mergeCoplanar(faces, sides);
	tidy(faces, nodes, 1e-6 * scale);

	// Every plane must meet its neighbours at its corners' heights, or it is not a roof of planes.
	for (let id = 0; id < nodes.length; id++) {
		const hs = faces
			.filter((f) => f.nodes.includes(id))
			.map((f) => height(sides[f.sides[0]], [nodes[id].x, nodes[id].y]));
		if (hs.length > 1 && Math.max(...hs) - Math.min(...hs) > 1e-3) {
			return fail(
				'gableEdges',
				'these gable ends do not make a roof of flat planes on this outline; try fewer gable ends or the hip form'
			);
		}
	}

	const gableSides = sides.filter((s) => s.gable);
	const built: BuiltFace[] = faces.map((f) => {
		const side = sides[f.sides[0]];
		const ring: XY[] = f.nodes.map((id) => [nodes[id].x, nodes[id].y]);
		const edges = f.nodes.map((u, k): EdgeKind => {
			const v = f.nodes[(k + 1) % f.nodes.length];
			const pu: XY = [nodes[u].x, nodes[u].y];
			const pv: XY = [nodes[v].x, nodes[v].y];
			if (nodes[u].corner && nodes[v].corner) return 'eave';
			const len = Math.hypot(pv[0] - pu[0], pv[1] - pu[1]);
			if (
				gableSides.some(
					(s) =>
						Math.abs(distTo(s, pu)) < 1e-6 * Math.max(1, len) &&
						Math.abs(distTo(s, pv)) < 1e-6 * Math.max(1, len)
				)
			) {
				return 'rake';
			}
			if (Math.abs(height(side, pu) - height(side, pv)) < 1e-6 * Math.max(1, len)) return 'ridge';
			const other = faces.find(
				(o) => o !== f && o.nodes.some((x, j) => x === v && o.nodes[(j + 1) % o.nodes.length] === u)
			);
			if (!other) return 'hip';
			// Just inside this plane, a hip has the neighbour's plane above it (the roof folds
			// down on both sides); a valley has it below.
			const mid: XY = [(pu[0] + pv[0]) / 2, (pu[1] + pv[1]) / 2];
			const e = 1e-3 * len;
			const p: XY = [mid[0] - ((pv[1] - pu[1]) / len) * e, mid[1] + ((pv[0] - pu[0]) / len) * e];
			return height(sides[other.sides[0]], p) > height(side, p) ? 'hip' : 'valley';
		});
		return { ring, edges, pitch: side.t * 12, side };
	});
	return { ok: true, faces: built };
}

/**
 * Skeleton points that the relocation put together become one node; a plane corner that lies
 * on a straight run in every plane around it (left by an event that changed nothing in the
 * roof) goes.
 */
function tidy(faces: Face[], nodes: Node[], tol: number) {
	const rep = nodes.map((_, i) => i);
	for (let i = 0; i < nodes.length; i++) {
		for (let j = 0; j < i; j++) {
			if (rep[j] === j && Math.hypot(nodes[i].x - nodes[j].x, nodes[i].y - nodes[j].y) <= tol) {
				rep[i] = j;
				if (nodes[i].corner) nodes[j].corner = true;
				break;
			}
		}
	}
	for (const f of faces) {
		const ids = f.nodes
			.map((id) => rep[id])
			.filter((id, k, a) => id !== a[(k - 1 + a.length) % a.length] || a.length === 1);
		f.nodes = ids;
	}
	for (let i = faces.length - 1; i >= 0; i--) if (faces[i].nodes.length < 3) faces.splice(i, 1);
	const straight = (f: Face, k: number) => {
		const m = f.nodes.length;
		const a = nodes[f.nodes[(k - 1 + m) % m]];
		const b = nodes[f.nodes[k]];
		const c = nodes[f.nodes[(k + 1) % m]];
		const cross = (b.x - a.x) * (c.y - b.y) - (b.y - a.y) * (c.x - b.x);
		const dot = (b.x - a.x) * (c.x - b.x) + (b.y - a.y) * (c.y - b.y);
		return dot > 0 && Math.abs(cross) <= tol * Math.hypot(c.x - a.x, c.y - a.y);
	};
	for (let id = 0; id < nodes.length; id++) {
		if (nodes[id].corner || rep[id] !== id) continue;
		const holders = faces.filter((f) => f.nodes.includes(id));
		if (holders.length === 0) continue;
		if (holders.every((f) => straight(f, f.nodes.indexOf(id)) && f.nodes.length > 3)) {
			for (const f of holders) f.nodes = f.nodes.filter((x) => x !== id);
		}
	}
}

function leastSquares(rows: ReadonlyArray<[number, number, number]>): XY | null {
	let aa = 0;
	let ab = 0;
	let bb = 0;
	let ac = 0;
	let bc = 0;
	for (const [a, b, c] of rows) {
		aa += a * a;
		ab += a * b;
		bb += b * b;
		ac += a * c;
		bc += b * c;
	}
	const det = aa * bb - ab * ab;
	if (!(Math.abs(det) > 1e-12 * Math.max(1, aa * bb))) return null;
	return [(ac * bb - bc * ab) / det, (aa * bc - ab * ac) / det];
}

function mergeCoplanar(faces: Face[], sides: Side[]) {
	const sameLine = (s: Side, o: Side) =>
		s.t === o.t && s.n[0] * o.n[0] + s.n[1] * o.n[1] > 1 - 1e-9 && Math.abs(distTo(s, o.q)) < 1e-6;
	for (let again = true; again;) {
		again = false;
		outer: for (let i = 0; i < faces.length; i++) {
			for (let j = i + 1; j < faces.length; j++) {
				if (!sameLine(sides[faces[i].sides[0]], sides[faces[j].sides[0]])) continue;
				const a = faces[i].nodes;
				const b = faces[j].nodes;
				const k = a.findIndex((u, x) => {
					const v = a[(x + 1) % a.length];
					return b.some((w, y) => w === v && b[(y + 1) % b.length] === u);
				});
				if (k < 0) continue;
				const v = a[(k + 1) % a.length];
				const y = b.indexOf(v);
				// a: … u → v …, b: … v → u …; the union runs a from v round to u, then b from u to v.
				const fromA: number[] = [];
				for (let s = 0; s < a.length; s++) fromA.push(a[(k + 1 + s) % a.length]);
				const fromB: number[] = [];
				for (let s = 2; s < b.length; s++) fromB.push(b[(y + s) % b.length]);
				const nodes = [...fromA, ...fromB];
				faces[i] = {
					sides: [...faces[i].sides, ...faces[j].sides],
					nodes: rotateToEave(nodes, faces[i].nodes)
				};
				faces.splice(j, 1);
				again = true;
				break outer;
			}
		}
	}
}

/** Keeps the plane's first eave first, so facet rings start where the user would expect. */
function rotateToEave(nodes: number[], before: number[]): number[] {
	const k = nodes.indexOf(before[0]);
	return k <= 0 ? nodes : [...nodes.slice(k), ...nodes.slice(0, k)];
}

// ---------------------------------------------------------------------------------------------
// Back to [lon, lat]

const COMPASS = [
	'North',
	'North-east',
	'East',
	'South-east',
	'South',
	'South-west',
	'West',
	'North-west'
];

function toFacet(f: BuiltFace, local: LocalPlane): FootprintFacet {
	const coords: Position[] = f.ring.map((p) => local.toLonLat(p));
	coords.push([...coords[0]]);
	// The outward normal of the plane's eave is the way water runs off it.
	const az = (Math.atan2(-f.side.n[0], -f.side.n[1]) * 180) / Math.PI;
	return {
		label: '',
		geometry: { type: 'Polygon', coordinates: [coords] },
		pitch: f.pitch,
		edges: f.edges,
		downslopeDeg: (az + 360) % 360
	};
}

function labelFacets(facets: FootprintFacet[]) {
	const counts = new Map<string, number>();
	const names = facets.map((f) => {
		const dir = COMPASS[Math.round(f.downslopeDeg / 45) % 8];
		const name = facets.length === 1 ? 'Roof' : `${dir} slope`;
		counts.set(name, (counts.get(name) ?? 0) + 1);
		return name;
	});
	const seen = new Map<string, number>();
	facets.forEach((f, i) => {
		const name = names[i];
		if ((counts.get(name) ?? 0) > 1) {
			const k = (seen.get(name) ?? 0) + 1;
			seen.set(name, k);
			f.label = `${name} ${k}`;
		} else f.label = name;
	});
}
