/**
 * Checks a summary.json object against the committed JSON Schema (docs/summary.schema.json, generated from
 * the Summary interface by scripts/make-summary-schema.mjs), with ajv, a general-purpose JSON Schema
 * validator. Every test that writes or reads a summary.json passes it through here.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import Ajv from 'ajv';
import { expect } from 'vitest';

const schema = JSON.parse(readFileSync(new URL('../../docs/summary.schema.json', import.meta.url), 'utf8'));
const validate = new Ajv({ allErrors: true, strict: false }).compile(schema);

/** Fails the test, naming the offending paths, when `summary` (parsed JSON) does not follow the schema. */
export function expectValidSummary(summary: unknown, what = 'summary.json'): void {
  const ok = validate(JSON.parse(JSON.stringify(summary)));
  const errors = (validate.errors ?? []).slice(0, 8).map((e) => `${e.instancePath || '/'} ${e.message}${e.params ? ` ${JSON.stringify(e.params)}` : ''}`);
  expect(ok ? [] : errors, `${what} against docs/summary.schema.json`).toEqual([]);
}

/** Checks every *.summary.json file in a folder; returns how many there were. */
export function expectValidSummaryFiles(dir: string): number {
  const files = readdirSync(dir).filter((f) => f.endsWith('.summary.json') && !f.startsWith('final.'));
  for (const f of files) expectValidSummary(JSON.parse(readFileSync(join(dir, f), 'utf8')), f);
  return files.length;
}

const failedSchema = JSON.parse(readFileSync(new URL('../../docs/failed-summary.schema.json', import.meta.url), 'utf8'));
const validateFailed = new Ajv({ allErrors: true, strict: false }).compile(failedSchema);

/** Fails the test when `summary` (parsed JSON) does not follow docs/failed-summary.schema.json (an input that failed). */
export function expectValidFailedSummary(summary: unknown, what = 'summary.json'): void {
  const ok = validateFailed(JSON.parse(JSON.stringify(summary)));
  const errors = (validateFailed.errors ?? []).slice(0, 8).map((e) => `${e.instancePath || '/'} ${e.message}${e.params ? ` ${JSON.stringify(e.params)}` : ''}`);
  expect(ok ? [] : errors, `${what} against docs/failed-summary.schema.json`).toEqual([]);
}
