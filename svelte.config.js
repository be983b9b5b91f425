import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	compilerOptions: { runes: true },
	kit: {
		adapter: adapter({ out: 'build' }),
		// Form posts from another origin are refused; JSON APIs add their own Origin check.
		csrf: { trustedOrigins: [] },
		// A second line behind text-only rendering: an injected script or handler is refused.
		// 'auto' gives rendered pages a nonce and prerendered ones a hash; no 'unsafe-inline' script.
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				// MapLibre starts its worker from a blob: URL.
				'worker-src': ['self', 'blob:'],
				'child-src': ['self', 'blob:'],
				// Svelte, Leaflet and MapLibre set style attributes; styles cannot run script.
				'style-src': ['self', 'unsafe-inline'],
				// The owner may set any https imagery host in Settings (validated as https://),
				// so tiles and their fetches may come from any https origin; plus data:/blob:
				// images that Leaflet, MapLibre and chart.js make.
				'img-src': ['self', 'data:', 'blob:', 'https:'],
				'connect-src': ['self', 'https:'],
				'font-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'frame-ancestors': ['none'],
				'form-action': ['self']
			}
		}
	}
};

export default config;
