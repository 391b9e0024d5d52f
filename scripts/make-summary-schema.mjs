#!/usr/bin/env node
// Writes docs/summary.schema.json, the JSON Schema of summary.json, from the Summary interface in
// src/core/summary.ts. Run after changing that interface: `node scripts/make-summary-schema.mjs`.
// A test (test/integration/summary-schema.test.ts) fails when the committed schema is out of date.
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { summarySchema } from './summary-schema.mjs';

const out = fileURLToPath(new URL('../docs/summary.schema.json', import.meta.url));
writeFileSync(out, `${JSON.stringify(summarySchema(), null, 2)}\n`);
process.stdout.write(`wrote ${out}\n`);
