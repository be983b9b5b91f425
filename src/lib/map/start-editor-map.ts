import { hasWebGL2, type EditorMap, type EditorMapOptions } from './editor-map';

export type Engine = 'maplibre' | 'leaflet';

/**
 * Starts the roof editor's map: MapLibre with draw where the browser has WebGL2, else the simpler
 * Leaflet editor rather than no map at all. Each is a dynamic import, so only this page loads them.
 * Throws if neither starts.
 */
export async function startEditorMap(
	opts: EditorMapOptions
): Promise<{ map: EditorMap; engine: Engine }> {
	// The container belongs to the map engines, not to Svelte: clear what a previous one left.
	opts.container.replaceChildren();
	try {
		if (!hasWebGL2()) throw new Error('no WebGL2');
		const { createMapLibreEditor } = await import('./maplibre-editor');
		return { map: await createMapLibreEditor(opts), engine: 'maplibre' };
	} catch (e) {
		console.info('Roof editor: using the Leaflet map', (e as Error).message);
		// MapLibre may have left a half-built canvas behind.
		opts.container.replaceChildren();
		const { createLeafletEditor } = await import('./leaflet-editor');
		return { map: await createLeafletEditor(opts), engine: 'leaflet' };
	}
}
