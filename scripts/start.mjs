#!/usr/bin/env node
// `npm start`: serves the built app at http://127.0.0.1:5173 (PORT to change it), building dist/ first when
// it is missing or older than any source it is built from. A built app starts in seconds and shows the
// demo's result made at build time; `npm run dev` is the development server.
import { existsSync, readdirSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');
/** What dist/ is built from. */
const SOURCES = ['src', 'workers', 'sample-images', 'index.html', 'vite.config.ts', 'package-lock.json', 'scripts/make-demo-result.ts'];

/** Newest modification time (ms) of a file, or of any file under a folder. */
export function newest(path) {
  if (!existsSync(path)) return 0;
  const s = statSync(path);
  if (!s.isDirectory()) return s.mtimeMs;
  let t = 0;
  for (const name of readdirSync(path)) t = Math.max(t, newest(join(path, name)));
  return t;
}

/** Whether dist/ (in `outDir`) must be built: no index.html, or a source newer than it. */
export function needsBuild(root = ROOT, outDir = join(root, 'dist')) {
  const index = join(outDir, 'index.html');
  if (!existsSync(index)) return true;
  const built = statSync(index).mtimeMs;
  return SOURCES.some((p) => newest(join(root, p)) > built);
}

async function start() {
  const { build, preview } = await import('vite');
  if (needsBuild()) {
    process.stdout.write('Building the app (once; again only after a change)…\n');
    await build({ root: ROOT, logLevel: 'warn' });
  }
  const port = Number(process.env.PORT ?? 5173);
  const server = await preview({ root: ROOT, preview: { host: '127.0.0.1', port, strictPort: true, open: false } });
  server.printUrls();
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  start().catch((e) => {
    process.stderr.write(`tessellab start: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exitCode = 1;
  });
}
