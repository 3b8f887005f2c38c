import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		adapter: adapter({ out: 'build' }),
		// The pages' Content-Security-Policy header. SvelteKit adds a fresh nonce per page to script-src
		// for its own inline start-up script and for the theme script in app.html (nonce="%sveltekit.nonce%");
		// no other inline script runs. Styles allow 'unsafe-inline' because Svelte sets style attributes
		// (plots, bars) at run time; SvelteKit then adds no nonce to style-src. Every other answer gets a
		// stricter policy from src/lib/server/http/securityHeaders.ts.
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				// Vite inlines the smallest @fontsource subsets as data: URLs.
				'font-src': ['self', 'data:'],
				'connect-src': ['self'],
				'worker-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		}
	}
};

export default config;
