// The JSON Schema of summary.json, generated from the Summary interface (src/core/summary.ts) with
// ts-json-schema-generator. Shared by scripts/make-summary-schema.mjs and the schema test.
import { createGenerator } from 'ts-json-schema-generator';
import { fileURLToPath } from 'node:url';

export function summarySchema() {
  const root = fileURLToPath(new URL('..', import.meta.url));
  const schema = createGenerator({
    path: `${root}src/core/summary.ts`,
    tsconfig: `${root}tsconfig.json`,
    type: 'Summary',
    expose: 'export',
    topRef: true,
    jsDoc: 'extended',
    additionalProperties: false,
    skipTypeCheck: true,
  }).createSchema('Summary');
  schema.$id = 'https://tessellab.invalid/summary.schema.json';
  schema.title = 'Tessellab summary.json';
  return schema;
}
