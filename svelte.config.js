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
		// A slip that lets user text in as markup still runs nothing: scripts need the nonce kit
		// adds to its own. Styles stay inline-able (Svelte, Leaflet and MapLibre set them); images
		// and tile requests may come from the owner's own https imagery source (Settings).
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:', 'https:'],
				'connect-src': ['self', 'https:'],
				'worker-src': ['self', 'blob:'],
				'font-src': ['self', 'data:'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		}
	}
};

export default config;
