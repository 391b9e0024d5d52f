/**
 * Checks a summary.json object against the committed JSON Schema (docs/summary.schema.json, generated from
 * the SummaryFile interface by scripts/make-summary-schema.mjs), with ajv, a general-purpose JSON Schema
 * validator. Every test that writes or reads a summary.json passes it through here.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import Ajv from 'ajv';
import { expect } from 'vitest';
import type { Analysis } from '../../src/core/analysis.types';
import { summaryJson } from '../../src/core/export/json';

const schema = JSON.parse(readFileSync(new URL('../../docs/summary.schema.json', import.meta.url), 'utf8'));
const validate = new Ajv({ allErrors: true, strict: false }).compile(schema);

/** Fails the test, naming the offending paths, when `summary` (parsed JSON) does not follow the schema. */
export function expectValidSummary(summary: unknown, what = 'summary.json'): void {
  const ok = validate(JSON.parse(JSON.stringify(summary)));
  const errors = (validate.errors ?? []).slice(0, 8).map((e) => `${e.instancePath || '/'} ${e.message}${e.params ? ` ${JSON.stringify(e.params)}` : ''}`);
  expect(ok ? [] : errors, `${what} against docs/summary.schema.json`).toEqual([]);
}

/** Checks the summary.json that the exporters write for an analysis (src/core/export/json.ts summaryJson). */
export function expectValidAnalysisSummary(analysis: Analysis, what = 'summary.json'): void {
  expectValidSummary(JSON.parse(summaryJson(analysis, { image: 'image.png' })), what);
}

/** Checks every *.summary.json file in a folder (failed inputs against their own schema); returns how many there were. */
export function expectValidSummaryFiles(dir: string): number {
  const files = readdirSync(dir).filter((f) => f.endsWith('.summary.json') && !f.startsWith('final.'));
  for (const f of files) {
    const s = JSON.parse(readFileSync(join(dir, f), 'utf8'));
    if ('error' in s && !('cells' in s)) expectValidFailedSummary(s, f);
    else expectValidSummary(s, f);
  }
  return files.length;
}

/** Checks every *.summary.json file in a folder and all folders below it; returns how many there were. */
export function expectValidSummaryTree(dir: string): number {
  let n = expectValidSummaryFiles(dir);
  for (const e of readdirSync(dir, { withFileTypes: true })) if (e.isDirectory()) n += expectValidSummaryTree(join(dir, e.name));
  return n;
}

const failedSchema = JSON.parse(readFileSync(new URL('../../docs/failed-summary.schema.json', import.meta.url), 'utf8'));
const validateFailed = new Ajv({ allErrors: true, strict: false }).compile(failedSchema);

/** Fails the test when `summary` (parsed JSON) does not follow docs/failed-summary.schema.json (an input that failed). */
export function expectValidFailedSummary(summary: unknown, what = 'summary.json'): void {
  const ok = validateFailed(JSON.parse(JSON.stringify(summary)));
  const errors = (validateFailed.errors ?? []).slice(0, 8).map((e) => `${e.instancePath || '/'} ${e.message}${e.params ? ` ${JSON.stringify(e.params)}` : ''}`);
  expect(ok ? [] : errors, `${what} against docs/failed-summary.schema.json`).toEqual([]);
}
