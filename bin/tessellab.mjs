#!/usr/bin/env node
// Runs the TypeScript command line directly (no build step): tsx compiles on the fly. On Linux it first
// starts itself again with huge pages for its large arrays (see src/node/hugePages.ts).
import { spawn } from 'node:child_process';
import { constants } from 'node:os';
import { fileURLToPath } from 'node:url';
import { register } from 'tsx/esm/api';

register();
const { wantsHugePages, withHugePages } = await import('../src/node/hugePages.ts');

if (wantsHugePages(process.env, process.platform)) {
  const child = spawn(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url), ...process.argv.slice(2)], {
    stdio: 'inherit',
    env: withHugePages(process.env),
  });
  // A signal meant for the command line reaches the process doing the work.
  for (const s of ['SIGINT', 'SIGTERM', 'SIGHUP']) process.on(s, () => child.kill(s));
  child.on('error', (e) => {
    console.error(`tessellab: could not start the command line (${e.message}).`);
    process.exitCode = 1;
  });
  child.on('exit', (code, signal) => {
    process.exitCode = code ?? 128 + (signal ? constants.signals[signal] : 0);
  });
} else {
  const { main } = await import('../src/cli/main.ts');
  process.exitCode = await main(process.argv.slice(2));
}
