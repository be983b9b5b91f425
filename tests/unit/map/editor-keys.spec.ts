// The roof editor's key bindings (src/lib/map/editor-keys.ts).
// Key names are the `KeyboardEvent.key` values of the W3C "UI Events KeyboardEvent key Values"
// specification (' ' for the space bar, 'ArrowLeft', 'Backspace', 'Escape', 'Enter'). Ctrl+Z for
// undo and Ctrl+Shift+Z / Ctrl+Y for redo are the common desktop convention (common practice, no
// single source); Escape to dismiss and arrows to move a focused item follow the WAI-ARIA
// Authoring Practices Guide's keyboard interface guidance.
import { describe, expect, it } from 'vitest';
import {
	editorKey,
	keyTarget,
	type EditorKeyState,
	type KeyPress,
	type KeyTarget
} from '../../../src/lib/map/editor-keys';

const press = (key: string, target: KeyTarget = 'map', mods: Partial<KeyPress> = {}): KeyPress => ({
	key,
	target,
	shiftKey: false,
	ctrlKey: false,
	metaKey: false,
	altKey: false,
	...mods
});
const browse: EditorKeyState = {
	readOnly: false,
	drawing: false,
	hasSelection: false,
	mode: 'browse'
};
const selected: EditorKeyState = { ...browse, hasSelection: true };
const drawing: EditorKeyState = { ...browse, drawing: true, mode: 'draw' };
const name = (e: KeyPress, s: EditorKeyState) => editorKey(e, s)?.command.name ?? null;

describe('undo and redo', () => {
	it('maps Ctrl+Z, Cmd+Z, Ctrl+Shift+Z and Ctrl+Y, and keeps them from the map', () => {
		expect(editorKey(press('z', 'other', { ctrlKey: true }), browse)).toEqual({
			command: { name: 'undo' },
			preventDefault: true,
			stopPropagation: true
		});
		expect(name(press('z', 'canvas', { metaKey: true }), browse)).toBe('undo');
		expect(name(press('Z', 'map', { ctrlKey: true, shiftKey: true }), browse)).toBe('redo');
		expect(name(press('y', 'row', { ctrlKey: true }), browse)).toBe('redo');
	});
	it('leaves undo to a text field being typed in', () => {
		expect(editorKey(press('z', 'typing', { ctrlKey: true }), browse)).toBeNull();
		expect(editorKey(press('y', 'typing', { metaKey: true }), browse)).toBeNull();
	});
	it('still undoes in a read-only view (only local edits are undone)', () => {
		expect(name(press('z', 'map', { ctrlKey: true }), { ...browse, readOnly: true })).toBe('undo');
	});
});

describe('nothing happens', () => {
	it('while typing, in a read-only view, or with Alt or a modifier held', () => {
		expect(editorKey(press('n', 'typing'), browse)).toBeNull();
		expect(editorKey(press('n', 'map'), { ...browse, readOnly: true })).toBeNull();
		expect(editorKey(press('n', 'map', { altKey: true }), browse)).toBeNull();
		expect(editorKey(press('n', 'map', { ctrlKey: true }), browse)).toBeNull();
		expect(editorKey(press('Delete', 'map'), browse)).toBeNull();
		expect(editorKey(press('x', 'map'), selected)).toBeNull();
	});
});

describe('while drawing', () => {
	it('Backspace and Delete take back the last corner, anywhere', () => {
		for (const t of ['canvas', 'map', 'row', 'other'] as const) {
			expect(editorKey(press('Backspace', t), drawing)).toEqual({
				command: { name: 'remove-last-corner' },
				preventDefault: true,
				stopPropagation: true
			});
			expect(name(press('Delete', t), drawing)).toBe('remove-last-corner');
		}
	});
	it('Enter finishes and Escape cancels, except on the canvas where draw handles them', () => {
		expect(name(press('Enter', 'map'), drawing)).toBe('finish-drawing');
		expect(name(press('Escape', 'other'), drawing)).toBe('cancel-drawing');
		expect(editorKey(press('Enter', 'canvas'), drawing)).toBeNull();
		expect(editorKey(press('Escape', 'canvas'), drawing)).toBeNull();
	});
	it('Space places a corner at the cross only from the map (not its canvas, not a row)', () => {
		expect(name(press(' ', 'map'), drawing)).toBe('corner-at-centre');
		expect(editorKey(press(' ', 'canvas'), drawing)).toBeNull();
		expect(editorKey(press(' ', 'row'), drawing)).toBeNull();
	});
	it('ignores browse keys such as N and the arrows', () => {
		expect(editorKey(press('n', 'map'), { ...drawing, hasSelection: true })).toBeNull();
		expect(editorKey(press('ArrowLeft', 'map'), { ...drawing, hasSelection: true })).toBeNull();
	});
});

describe('with a facet selected', () => {
	it('arrows nudge 1 px, 10 px with Shift, from the map or a facet row', () => {
		expect(editorKey(press('ArrowLeft', 'canvas'), selected)).toEqual({
			command: { name: 'nudge', dx: -1, dy: 0 },
			preventDefault: true,
			stopPropagation: true
		});
		expect(editorKey(press('ArrowDown', 'row', { shiftKey: true }), selected)?.command).toEqual({
			name: 'nudge',
			dx: 0,
			dy: 10
		});
		expect(editorKey(press('ArrowUp', 'map'), selected)?.command).toEqual({
			name: 'nudge',
			dx: 0,
			dy: -1
		});
		expect(editorKey(press('ArrowRight', 'other'), selected)).toBeNull();
		expect(editorKey(press('ArrowRight', 'map'), browse)).toBeNull();
	});
	it('Delete or Backspace removes it from the map or a row, not from elsewhere', () => {
		expect(name(press('Delete', 'row'), selected)).toBe('delete-selected');
		expect(name(press('Backspace', 'canvas'), selected)).toBe('delete-selected');
		expect(editorKey(press('Delete', 'other'), selected)).toBeNull();
	});
	it('[ and ] step through corners', () => {
		expect(editorKey(press(']', 'other'), selected)?.command).toEqual({
			name: 'pick-corner',
			step: 1
		});
		expect(editorKey(press('[', 'map'), selected)?.command).toEqual({
			name: 'pick-corner',
			step: -1
		});
		expect(editorKey(press(']', 'map'), browse)).toBeNull();
	});
	it('Enter on the map edits corners, unless already editing them', () => {
		expect(name(press('Enter', 'map'), selected)).toBe('edit-corners');
		expect(editorKey(press('Enter', 'map'), { ...selected, mode: 'corners' })).toBeNull();
		expect(editorKey(press('Enter', 'row'), selected)).toBeNull();
	});
	it('Escape deselects and lets the key through for other handlers', () => {
		expect(editorKey(press('Escape', 'row'), selected)).toEqual({
			command: { name: 'deselect' },
			preventDefault: false,
			stopPropagation: false
		});
		expect(editorKey(press('Escape', 'other'), selected)).toBeNull();
		expect(editorKey(press('Escape', 'map'), browse)).toBeNull();
	});
});

describe('N', () => {
	it('starts drawing, in either case, except from a facet row', () => {
		expect(name(press('n', 'other'), browse)).toBe('start-drawing');
		expect(name(press('N', 'canvas', { shiftKey: true }), selected)).toBe('start-drawing');
		expect(editorKey(press('n', 'row'), browse)).toBeNull();
	});
});

describe('O', () => {
	it('starts a roof from an outline, except while typing, drawing, read-only or on a row', () => {
		expect(name(press('o', 'map'), browse)).toBe('start-outline');
		expect(name(press('O', 'other', { shiftKey: true }), selected)).toBe('start-outline');
		expect(editorKey(press('o', 'row'), browse)).toBeNull();
		expect(editorKey(press('o', 'typing'), browse)).toBeNull();
		expect(editorKey(press('o', 'map'), drawing)).toBeNull();
		expect(editorKey(press('o', 'map'), { ...browse, readOnly: true })).toBeNull();
	});
});

describe('keyTarget', () => {
	// Stand-ins for elements: `closest` answers for the selectors the element would match.
	const el = (matches: string[], classes: string[] = []) => ({
		closest: (sel: string) => (matches.some((m) => sel.includes(m)) ? {} : null),
		classList: { contains: (c: string) => classes.includes(c) }
	});
	it('tells fields, the canvas, the map and facet rows apart', () => {
		expect(keyTarget(el(['input']))).toBe('typing');
		expect(keyTarget(el(['[contenteditable="true"]']))).toBe('typing');
		expect(keyTarget(el(['[data-map]'], ['maplibregl-canvas']))).toBe('canvas');
		expect(keyTarget(el(['[data-map]']))).toBe('map');
		expect(keyTarget(el(['[data-facet-row]']))).toBe('row');
		expect(keyTarget(el([]))).toBe('other');
		expect(keyTarget(null)).toBe('other');
		expect(keyTarget({})).toBe('other');
	});
});
