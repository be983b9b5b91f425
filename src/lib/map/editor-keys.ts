/**
 * The roof editor's keyboard: which command a key press means, given where it happened and what
 * the editor is doing. Pure, so every binding is tested without a map or a browser.
 */

/** Where a key press landed: a text field, MapLibre's canvas, elsewhere on the map, a facet row. */
export type KeyTarget = 'typing' | 'canvas' | 'map' | 'row' | 'other';

export type KeyPress = {
	key: string;
	shiftKey: boolean;
	ctrlKey: boolean;
	metaKey: boolean;
	altKey: boolean;
	target: KeyTarget;
};

export type EditorKeyState = {
	readOnly: boolean;
	/** A facet is being drawn. */
	drawing: boolean;
	hasSelection: boolean;
	mode: 'browse' | 'draw' | 'corners';
};

export type EditorCommand =
	| { name: 'undo' }
	| { name: 'redo' }
	| { name: 'remove-last-corner' }
	| { name: 'finish-drawing' }
	| { name: 'cancel-drawing' }
	| { name: 'corner-at-centre' }
	| { name: 'nudge'; dx: number; dy: number }
	| { name: 'delete-selected' }
	| { name: 'pick-corner'; step: 1 | -1 }
	| { name: 'edit-corners' }
	| { name: 'deselect' }
	| { name: 'start-drawing' }
	| { name: 'start-outline' };

export type KeyAction = {
	command: EditorCommand;
	/** Keep the browser's own meaning of the key (scrolling, back, typing). */
	preventDefault: boolean;
	/** Keep the map's own handlers (draw's, MapLibre's keyboard pan) from acting on it too. */
	stopPropagation: boolean;
};

const ARROWS: Record<string, [number, number]> = {
	ArrowLeft: [-1, 0],
	ArrowRight: [1, 0],
	ArrowUp: [0, -1],
	ArrowDown: [0, 1]
};

const act = (command: EditorCommand, stop = false, prevent = true): KeyAction => ({
	command,
	preventDefault: prevent,
	stopPropagation: stop
});

export function editorKey(e: KeyPress, s: EditorKeyState): KeyAction | null {
	const { key, target } = e;
	const typing = target === 'typing';
	const onCanvas = target === 'canvas';
	const onMap = onCanvas || target === 'map';
	const onRow = target === 'row';
	const mod = e.ctrlKey || e.metaKey;

	// Undo works in read-only views too (it only undoes local edits) but never inside a text field,
	// where the field's own undo is what the user means.
	if (mod && (key === 'z' || key === 'Z' || key === 'y')) {
		if (typing) return null;
		return act({ name: key === 'y' || e.shiftKey ? 'redo' : 'undo' }, true);
	}
	if (typing || s.readOnly || mod || e.altKey) return null;

	if (s.drawing) {
		if (key === 'Backspace' || key === 'Delete') return act({ name: 'remove-last-corner' }, true);
		// On the canvas, draw's own handlers already finish and cancel.
		if (key === 'Enter' && !onCanvas) return act({ name: 'finish-drawing' });
		if (key === 'Escape' && !onCanvas) return act({ name: 'cancel-drawing' });
		if (key === ' ' && onMap && !onCanvas) return act({ name: 'corner-at-centre' });
		return null;
	}
	const arrow = ARROWS[key];
	if (arrow && s.hasSelection && (onMap || onRow)) {
		const step = e.shiftKey ? 10 : 1;
		return act({ name: 'nudge', dx: arrow[0] * step, dy: arrow[1] * step }, true);
	}
	if ((key === 'Delete' || key === 'Backspace') && s.hasSelection && (onMap || onRow)) {
		return act({ name: 'delete-selected' }, true);
	}
	if ((key === ']' || key === '[') && s.hasSelection) {
		return act({ name: 'pick-corner', step: key === ']' ? 1 : -1 });
	}
	if (key === 'Enter' && onMap && s.hasSelection && s.mode !== 'corners') {
		return act({ name: 'edit-corners' });
	}
	// Escape also closes other things (menus, dialogs): let it through.
	if (key === 'Escape' && (onMap || onRow) && s.hasSelection) {
		return act({ name: 'deselect' }, false, false);
	}
	if ((key === 'n' || key === 'N') && !onRow) return act({ name: 'start-drawing' });
	if ((key === 'o' || key === 'O') && !onRow) return act({ name: 'start-outline' });
	return null;
}

type ElementLike = {
	closest?: (selector: string) => unknown;
	classList?: { contains: (name: string) => boolean };
};

/** Where in the editor an event's target sits. */
export function keyTarget(el: ElementLike | null): KeyTarget {
	if (!el) return 'other';
	if (el.closest?.('input, textarea, select, [contenteditable="true"]')) return 'typing';
	if (el.classList?.contains('maplibregl-canvas')) return 'canvas';
	if (el.closest?.('[data-map]')) return 'map';
	if (el.closest?.('[data-facet-row]')) return 'row';
	return 'other';
}
