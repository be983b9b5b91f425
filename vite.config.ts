import tailwindcss from '@tailwindcss/vite';
import { sveltekit } from '@sveltejs/kit/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	server: { port: 5173 },
	// MapLibre alone is ~1 MB minified; it loads on demand on the roof editor only
	// (scripts/check-bundle.js enforces that), so its chunk size is expected.
	build: { chunkSizeWarningLimit: 1100 },
	test: {
		expect: { requireAssertions: true },
		projects: [
			{
				extends: true,
				test: { name: 'unit', include: ['tests/unit/**/*.spec.ts'], environment: 'node' }
			},
			{
				extends: true,
				test: {
					name: 'integration',
					include: ['tests/integration/**/*.spec.ts'],
					environment: 'node',
					testTimeout: 60_000,
					hookTimeout: 180_000,
					fileParallelism: false
				}
			},
			{
				extends: true,
				test: {
					name: 'e2e',
					include: ['tests/e2e/**/*.e2e.ts'],
					environment: 'node',
					testTimeout: 120_000,
					hookTimeout: 240_000,
					fileParallelism: false
				}
			}
		]
	}
});
