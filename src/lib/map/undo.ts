/**
 * Undo and redo over whole snapshots of the plan. A roof plan is small (≤ 100 facets), so a
 * snapshot per change is simpler and safer than inverse operations, and it can never drift.
 */
export class History<T> {
	#past: T[] = [];
	#present: T;
	#future: T[] = [];
	readonly limit: number;

	constructor(initial: T, limit = 200) {
		if (!(limit >= 1)) throw new RangeError('history limit must be at least 1');
		this.#present = snapshot(initial);
		this.limit = limit;
	}

	get present(): T {
		return this.#present;
	}
	get canUndo(): boolean {
		return this.#past.length > 0;
	}
	get canRedo(): boolean {
		return this.#future.length > 0;
	}
	get undoDepth(): number {
		return this.#past.length;
	}

	/** Records a new state; anything that was undone is dropped, as in every editor. */
	push(next: T): void {
		this.#past.push(this.#present);
		if (this.#past.length > this.limit) this.#past.shift();
		this.#present = snapshot(next);
		this.#future = [];
	}

	undo(): T | undefined {
		const prev = this.#past.pop();
		if (prev === undefined) return undefined;
		this.#future.push(this.#present);
		this.#present = prev;
		return snapshot(prev);
	}

	redo(): T | undefined {
		const next = this.#future.pop();
		if (next === undefined) return undefined;
		this.#past.push(this.#present);
		this.#present = next;
		return snapshot(next);
	}

	/** Starts over from a loaded plan: nothing before it can be undone. */
	reset(state: T): void {
		this.#past = [];
		this.#future = [];
		this.#present = snapshot(state);
	}
}

/** Copies in and out, so a caller mutating its own object can never rewrite history. */
function snapshot<T>(v: T): T {
	return structuredClone(v);
}
