// Undo and redo over snapshots of the plan (src/lib/map/undo.ts).
import { describe, expect, it } from 'vitest';
import { History } from '../../../src/lib/map/undo';

describe('History', () => {
	it('steps back and forward through every change, in order', () => {
		const h = new History<number[]>([]);
		h.push([1]);
		h.push([1, 2]);
		h.push([1, 2, 3]);
		expect(h.undo()).toEqual([1, 2]);
		expect(h.undo()).toEqual([1]);
		expect(h.redo()).toEqual([1, 2]);
		expect(h.undo()).toEqual([1]);
		expect(h.undo()).toEqual([]);
		expect(h.canUndo).toBe(false);
		expect(h.undo()).toBeUndefined();
		expect(h.present).toEqual([]);
		expect(h.redo()).toEqual([1]);
	});

	it('drops the redo branch when a new change is made after an undo', () => {
		const h = new History('a');
		h.push('b');
		h.push('c');
		h.undo();
		expect(h.canRedo).toBe(true);
		h.push('d');
		expect(h.canRedo).toBe(false);
		expect(h.redo()).toBeUndefined();
		expect(h.undo()).toBe('b');
	});

	it('keeps at most `limit` steps, forgetting the oldest', () => {
		const h = new History(0, 3);
		for (let i = 1; i <= 10; i++) h.push(i);
		expect(h.undoDepth).toBe(3);
		expect([h.undo(), h.undo(), h.undo(), h.undo()]).toEqual([9, 8, 7, undefined]);
		expect(() => new History(0, 0)).toThrow(RangeError);
	});

	it('is not changed by mutating what went in or came out', () => {
		const facet = {
			id: 'f1',
			pitch: 6,
			ring: [
				[0, 0],
				[1, 0],
				[1, 1],
				[0, 0]
			]
		};
		const h = new History<(typeof facet)[]>([]);
		const plan = [facet];
		h.push(plan);
		facet.pitch = 12;
		facet.ring[0][0] = 99;
		plan.push({ ...facet, id: 'f2' });
		h.push([]);
		const back = h.undo()!;
		expect(back).toEqual([
			{
				id: 'f1',
				pitch: 6,
				ring: [
					[0, 0],
					[1, 0],
					[1, 1],
					[0, 0]
				]
			}
		]);
		back[0].pitch = 2;
		expect(h.present[0].pitch).toBe(6);
	});

	it('reset forgets everything before a loaded plan', () => {
		const h = new History(['x']);
		h.push(['y']);
		h.reset(['loaded']);
		expect(h.canUndo).toBe(false);
		expect(h.canRedo).toBe(false);
		expect(h.present).toEqual(['loaded']);
	});
});
