import { defineConfig } from 'vitest/config';
import { svelte } from '@sveltejs/vite-plugin-svelte';
import type { Plugin } from 'vite';
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = dirname(fileURLToPath(import.meta.url));
/** The demo's precomputed result beside index.html; the page reads the same name (src/ui/samples.ts). */
const DEMO_RESULT_FILE = 'demo-result.bin';

/**
 * The page's Content Security Policy (also in index.html's meta tag) sent as a header by `vite preview`,
 * so that it binds the worker too: only this origin may be reached. The analysis worker's own policy adds
 * 'unsafe-eval' because opencv.js (Emscripten's embind) builds functions from strings; the page keeps
 * the strict one. Files under assets/ are sent as immutable (their names change with their content).
 */
const CSP = "default-src 'self'; script-src 'self' 'wasm-unsafe-eval'; worker-src 'self' blob:; style-src 'self' 'unsafe-inline'; img-src 'self' data: blob:; font-src 'self' data:; connect-src 'self'; object-src 'none'; base-uri 'self'; form-action 'none'; frame-src 'none'";
const WORKER_CSP = CSP.replace("script-src 'self' 'wasm-unsafe-eval'", "script-src 'self' 'wasm-unsafe-eval' 'unsafe-eval'");
function cspHeaders(): Plugin {
  return {
    name: 'tessellab-csp',
    configurePreviewServer(server) {
      server.middlewares.use((req, res, next) => {
        res.setHeader('Content-Security-Policy', /analysis\.worker/.test(req.url ?? '') ? WORKER_CSP : CSP);
        // Built files carry their content's digest in their names: a browser keeps them (opencv.js too)
        // and a reload reads them from its cache. index.html and the demo's result are checked each time.
        if (/^\/assets\//.test(new URL(req.url ?? '/', 'http://x').pathname)) res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
        next();
      });
    },
  };
}

/** Files whose content decides the demo's precomputed result: the pipeline, its inputs and the packages. */
function demoInputs(): string[] {
  const out: string[] = [];
  const walk = (d: string): void => {
    for (const n of readdirSync(d).sort()) {
      const p = join(d, n);
      if (statSync(p).isDirectory()) walk(p); else out.push(p);
    }
  };
  for (const d of ['src/core', 'src/app', 'src/node']) walk(join(ROOT, d));
  out.push(...['src/ui/samples.ts', 'scripts/make-demo-result.ts', 'package-lock.json'].map((f) => join(ROOT, f)));
  walk(join(ROOT, 'sample-images'));
  return out;
}

/**
 * The demo's result, made by the project's own pipeline (scripts/make-demo-result.ts) and shipped beside
 * index.html, so that the app shows it before its engine has loaded. Kept under node_modules/.cache by
 * the digest of everything it depends on, so a build makes it only when one of those changed.
 */
function demoResult(): Plugin {
  return {
    name: 'tessellab-demo-result',
    apply: 'build',
    generateBundle() {
      const h = createHash('sha256');
      for (const f of demoInputs()) h.update(f.slice(ROOT.length)).update(readFileSync(f));
      const dir = join(ROOT, 'node_modules/.cache/tessellab');
      const file = join(dir, `demo-result-${h.digest('hex').slice(0, 16)}.bin`);
      if (!existsSync(file)) {
        mkdirSync(dir, { recursive: true });
        const tmp = `${file}.${process.pid}.tmp`;
        execFileSync(process.execPath, ['--import', 'tsx', join(ROOT, 'scripts/make-demo-result.ts'), tmp], { cwd: ROOT, stdio: ['ignore', 'ignore', 'inherit'] });
        renameSync(tmp, file);
      }
      this.emitFile({ type: 'asset', fileName: DEMO_RESULT_FILE, source: readFileSync(file) });
    },
  };
}

export default defineConfig({
  plugins: [svelte(), cspHeaders(), demoResult()],
  base: './',
  worker: {
    format: 'es',
    // opencv.js gets a chunk of its own name (it is the one large download the engine waits for).
    rolldownOptions: { output: { chunkFileNames: (c) => (c.moduleIds.some((id) => id.includes('@techstark/opencv-js')) ? 'assets/opencv-[hash].js' : 'assets/[name]-[hash].js') } },
  },
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
