import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
// vitest/config, not vite: svelte-check otherwise rejects the `test` key.
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	build: {
		// The timing heuristic fires on 2-core machines for a normal Svelte build; it is noise.
		rolldownOptions: { checks: { bundlerTimings: false } }
	},
	test: {
		projects: [
			{
				extends: true,
				test: {
					name: 'unit',
					include: ['tests/unit/**/*.test.ts'],
					setupFiles: ['tests/unit/fast-check-seed.ts'],
					environment: 'node',
					// A ceiling against a hang, not a timing check: property tests take a few seconds on a
					// quiet 2-core machine and several times that when it is busy.
					testTimeout: 60_000
				}
			},
			{
				extends: true,
				test: {
					name: 'integration',
					include: ['tests/integration/**/*.test.ts'],
					environment: 'node',
					// Migrates the test database and serves the app once for every integration file.
					globalSetup: ['./tests/integration/support/global-setup.ts'],
					// One MariaDB, shared tables: run files one after another.
					fileParallelism: false,
					testTimeout: 30_000,
					hookTimeout: 60_000
				}
			}
		]
	}
});
