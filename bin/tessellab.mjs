#!/usr/bin/env node
// Runs the TypeScript command line directly (no build step): tsx compiles on the fly.
import { register } from 'tsx/esm/api';
register();
const { main } = await import('../src/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
