import type { KnipConfig } from 'knip';

/** Dead exports and unused packages; `npm test` fails on any finding. */
const config: KnipConfig = {
	entry: [
		'src/routes/**/+{page,layout,server,error}{,.server}.{ts,svelte}',
		'src/routes/**/+page@.svelte',
		'src/lib/server/pricing/worker.ts',
		'scripts/**/*.{ts,js}',
		'bench/**/*.ts',
		'geodata/*.{ts,js}',
		'tests/**/*.{ts,js}'
	],
	project: [
		'src/**/*.{ts,svelte,css}',
		'scripts/**/*.{ts,js}',
		'bench/**/*.ts',
		'geodata/*.{ts,js}',
		'tests/**/*.ts'
	],
	ignoreExportsUsedInFile: true,
	// Tailwind and the fonts are imported from app.css: follow CSS @imports and @plugins.
	compilers: {
		css: (text: string) =>
			[...text.matchAll(/@(?:import|plugin)\s+['"]([^'"]+)['"]/g)]
				.map(([, spec]) => `import '${spec}';`)
				.join('\n')
	}
};

export default config;
