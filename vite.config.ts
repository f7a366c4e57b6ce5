import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	server: { host: '127.0.0.1' },
	test: {
		include: ['tests/**/*.test.ts'],
		exclude: ['tests/e2e/**', 'node_modules/**'],
		environment: 'node',
		testTimeout: 120_000,
		hookTimeout: 120_000,
		// integration tests share one database and real worker processes: run files one at a time
		fileParallelism: false
	}
});
