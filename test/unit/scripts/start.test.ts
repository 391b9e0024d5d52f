/**
 * `npm start` (scripts/start.mjs) builds the app only when dist/ is missing or older than a source it is
 * built from, and otherwise serves the build it has.
 */
import { mkdirSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
// @ts-expect-error -- a plain .mjs module of the project's scripts, without type declarations
import { needsBuild } from '../../../scripts/start.mjs';

const root = mkdtempSync(join(tmpdir(), 'tessellab-start-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function touch(path: string, secondsAgo: number): void {
  const t = Date.now() / 1000 - secondsAgo;
  utimesSync(join(root, path), t, t);
}

describe('npm start', () => {
  it('builds when dist/ is missing, not when it is newer than every source, and again after a change', () => {
    mkdirSync(join(root, 'src/ui'), { recursive: true });
    writeFileSync(join(root, 'src/ui/a.ts'), 'export {};\n');
    writeFileSync(join(root, 'index.html'), '<!doctype html>\n');
    touch('src/ui/a.ts', 100);
    touch('index.html', 100);
    expect(needsBuild(root)).toBe(true);
    mkdirSync(join(root, 'dist'));
    writeFileSync(join(root, 'dist/index.html'), '<!doctype html>\n');
    touch('dist/index.html', 50);
    expect(needsBuild(root)).toBe(false);
    touch('src/ui/a.ts', 10);
    expect(needsBuild(root)).toBe(true);
  });
});
