// mapbox-gl-draw ships no types; this covers the part the roof editor uses.
declare module '@mapbox/mapbox-gl-draw' {
	import type { Feature, FeatureCollection } from 'geojson';

	/* eslint-disable @typescript-eslint/no-explicit-any */
	export type DrawMode = Record<string, any>;

	export interface DrawOptions {
		displayControlsDefault?: boolean;
		controls?: Record<string, boolean>;
		userProperties?: boolean;
		keybindings?: boolean;
		touchEnabled?: boolean;
		boxSelect?: boolean;
		clickBuffer?: number;
		touchBuffer?: number;
		styles?: object[];
		modes?: Record<string, DrawMode>;
		defaultMode?: string;
	}

	export default class MapboxDraw {
		constructor(options?: DrawOptions);
		static modes: Record<
			'draw_polygon' | 'direct_select' | 'simple_select' | 'draw_point' | 'draw_line_string',
			DrawMode
		>;
		static constants: {
			classes: Record<string, string>;
			modes: Record<string, string>;
			events: Record<string, string>;
		};
		onAdd(map: unknown): HTMLElement;
		onRemove(map: unknown): void;
		add(geojson: Feature | FeatureCollection): string[];
		get(id: string): Feature | undefined;
		getAll(): FeatureCollection;
		getSelectedIds(): string[];
		getSelected(): FeatureCollection;
		set(fc: FeatureCollection): string[];
		delete(ids: string | string[]): this;
		deleteAll(): this;
		trash(): this;
		getMode(): string;
		changeMode(mode: string, options?: object): this;
		setFeatureProperty(id: string, property: string, value: unknown): this;
	}
}
