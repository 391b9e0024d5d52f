// The JSON Schemas of summary.json, generated from the interfaces in src/core/summary.ts with
// ts-json-schema-generator: Summary (an analysed image) and FailedSummary (an input that could not be
// analysed). Shared by scripts/make-summary-schema.mjs and the schema tests.
import { createGenerator } from 'ts-json-schema-generator';
import { fileURLToPath } from 'node:url';

function schemaOf(type, id, title) {
  const root = fileURLToPath(new URL('..', import.meta.url));
  const schema = createGenerator({
    path: `${root}src/core/summary.ts`,
    tsconfig: `${root}tsconfig.json`,
    type,
    expose: 'export',
    topRef: true,
    jsDoc: 'extended',
    additionalProperties: false,
    skipTypeCheck: true,
  }).createSchema(type);
  schema.$id = id;
  schema.title = title;
  return schema;
}

export function summarySchema() {
  return schemaOf('SummaryFile', 'https://tessellab.invalid/summary.schema.json', 'Tessellab summary.json');
}

export function failedSummarySchema() {
  return schemaOf('FailedSummary', 'https://tessellab.invalid/failed-summary.schema.json', 'Tessellab summary.json of an input that could not be analysed');
}
