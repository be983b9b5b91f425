import type { Position } from 'geojson';
import type { EdgeKind } from '../estimating/types';

export type EdgeLabels = Array<EdgeKind | null>;

/**
 * Carries edge labels (eave, rake, ridge, hip, valley) across an outline edit. Moving corners
 * keeps every label; a corner added on a segment gives both halves that segment's label; a
 * corner removed merges two segments, which keep a label only if both had the same one.
 * Anything unmatched is left unlabelled rather than guessed.
 */
export function carryEdges(
	oldRing: Position[],
	oldEdges: EdgeLabels,
	newRing: Position[]
): EdgeLabels {
	const oldN = Math.max(0, oldRing.length - 1);
	const newN = Math.max(0, newRing.length - 1);
	if (oldEdges.length !== oldN) return new Array(newN).fill(null);
	if (oldN === newN) return [...oldEdges];

	const key = (p: Position) => `${p[0]},${p[1]}`;
	const oldIndex = new Map<string, number>();
	for (let i = 0; i < oldN; i++) oldIndex.set(key(oldRing[i]), i);
	const mapped = newRing.slice(0, newN).map((p) => oldIndex.get(key(p)));

	const out: EdgeLabels = new Array(newN).fill(null);
	for (let j = 0; j < newN; j++) {
		// The nearest matched corner at or before the segment start, and at or after its end.
		let back = 0;
		while (back < newN && mapped[(j - back + newN) % newN] === undefined) back++;
		let fwd = 0;
		while (fwd < newN && mapped[(j + 1 + fwd) % newN] === undefined) fwd++;
		if (back >= newN || fwd >= newN) continue;
		const a = mapped[(j - back + newN) % newN]!;
		const b = mapped[(j + 1 + fwd) % newN]!;
		const span = (b - a + oldN) % oldN;
		if (span === 1) {
			out[j] = oldEdges[a];
		} else if (span === 2 && back === 0 && fwd === 0 && newN < oldN) {
			const first = oldEdges[a];
			out[j] = first !== null && first === oldEdges[(a + 1) % oldN] ? first : null;
		}
	}
	return out;
}
