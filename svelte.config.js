import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	compilerOptions: { runes: true },
	kit: {
		adapter: adapter(),
		// Content-Security-Policy of every page: no inline script runs without SvelteKit's nonce
		// (server-rendered pages) or hash (prerendered ones). `src/lib/server/security.ts` gives every
		// other answer `default-src 'none'`.
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				// stylesheets only from the app itself (no injected <style> element runs) …
				'style-src-elem': ['self'],
				// … but style attributes need 'unsafe-inline': the server-rendered HTML carries them for
				// Svelte's `style:` directives (progress bars, legend swatches) and the wrapper in
				// app.html, uPlot positions its cursor and legend with them, and a nonce cannot cover an
				// attribute. `style-src` says the same for browsers without the two split directives.
				'style-src-attr': ['unsafe-inline'],
				'style-src': ['self', 'unsafe-inline'],
				// the fonts and images are the app's own files (small ones inlined by the build as data: URLs)
				'font-src': ['self', 'data:'],
				'img-src': ['self', 'data:'],
				'connect-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		},
		alias: {
			$solver: 'solver'
		}
	}
};

export default config;
