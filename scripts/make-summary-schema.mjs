#!/usr/bin/env node
// Writes docs/summary.schema.json and docs/failed-summary.schema.json, the JSON Schemas of summary.json, from
// the Summary and FailedSummary interfaces in src/core/summary.ts. Run after changing them:
// `node scripts/make-summary-schema.mjs`. Tests (test/integration/summary-keys.test.ts,
// test/unit/cli/failed-summary.test.ts) fail when a committed schema is out of date.
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { failedSummarySchema, summarySchema } from './summary-schema.mjs';

for (const [file, schema] of [['summary.schema.json', summarySchema()], ['failed-summary.schema.json', failedSummarySchema()]]) {
  const out = fileURLToPath(new URL(`../docs/${file}`, import.meta.url));
  writeFileSync(out, `${JSON.stringify(schema, null, 2)}\n`);
  process.stdout.write(`wrote ${out}\n`);
}
