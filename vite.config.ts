import { defineConfig } from 'vitest/config';
import { svelte } from '@sveltejs/vite-plugin-svelte';
import type { Plugin } from 'vite';

/**
 * The page's Content Security Policy (also in index.html's meta tag) sent as a header by `vite preview`,
 * so that it binds the worker too: only this origin may be reached. The analysis worker's own policy adds
 * 'unsafe-eval' because opencv.js (Emscripten's embind) builds functions from strings; the page keeps
 * the strict one.
 */
const CSP = "default-src 'self'; script-src 'self' 'wasm-unsafe-eval'; worker-src 'self' blob:; style-src 'self' 'unsafe-inline'; img-src 'self' data: blob:; font-src 'self' data:; connect-src 'self'; object-src 'none'; base-uri 'self'; form-action 'none'; frame-src 'none'";
const WORKER_CSP = CSP.replace("script-src 'self' 'wasm-unsafe-eval'", "script-src 'self' 'wasm-unsafe-eval' 'unsafe-eval'");
function cspHeaders(): Plugin {
  return {
    name: 'tessellab-csp',
    configurePreviewServer(server) {
      server.middlewares.use((req, res, next) => {
        res.setHeader('Content-Security-Policy', /analysis\.worker/.test(req.url ?? '') ? WORKER_CSP : CSP);
        next();
      });
    },
  };
}

export default defineConfig({
  plugins: [svelte(), cspHeaders()],
  base: './',
  worker: { format: 'es' },
  // The dev server's dependency scan also reads the workers, so that it bundles their dependencies at
  // start-up instead of finding them mid-analysis and reloading the page.
  optimizeDeps: { entries: ['index.html', 'workers/*.worker.ts'] },
  build: { target: 'es2022', chunkSizeWarningLimit: 12000 },
  server: { host: '127.0.0.1', port: 5173 },
  preview: { host: '127.0.0.1', port: 4173 },
  test: {
    include: ['test/**/*.test.ts'],
    environment: 'node',
    // A guard against a test that hangs, not a speed check: far above what any test takes on a loaded
    // machine, and no test sets a limit of its own (speed is measured by the benchmark, never asserted).
    testTimeout: 1_800_000,
    hookTimeout: 1_800_000,
    // expect.poll keeps polling until its assertion holds, up to the same guard (its own default is 1 s).
    expect: { poll: { timeout: 1_800_000 } },
    pool: 'forks',
  },
});
