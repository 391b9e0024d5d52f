#!/usr/bin/env node
// `npm run bench [-- --runs N --only id,id --browser --no-node]`: see test/bench/run.ts.
import { register } from 'tsx/esm/api';
register();
await import('../test/bench/run.ts');
