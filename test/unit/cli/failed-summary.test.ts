/**
 * summary.json of an input that could not be analysed: the committed JSON Schema
 * (docs/failed-summary.schema.json) is the one generated from the FailedSummary interface in
 * src/core/summary.ts (scripts/make-summary-schema.mjs), checked with ajv, a general-purpose JSON Schema
 * validator; the check accepts the shape the command line writes and rejects others.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { SUMMARY_VERSION, type FailedSummary } from '../../../src/core/summary';
// @ts-expect-error -- a plain .mjs module of the project's scripts, without type declarations
import { failedSummarySchema } from '../../../scripts/summary-schema.mjs';
import { expectValidFailedSummary, expectValidSummary } from '../../helpers/summary-schema';

describe('failed summary.json schema', () => {
  it('the committed docs/failed-summary.schema.json is the one generated from FailedSummary (run scripts/make-summary-schema.mjs)', () => {
    const committed = JSON.parse(readFileSync('docs/failed-summary.schema.json', 'utf8'));
    expect(committed).toEqual(JSON.parse(JSON.stringify(failedSummarySchema())));
  });

  it('accepts a failed input\'s record and rejects a wrong or incomplete one', () => {
    const ok: FailedSummary = { tessellab: SUMMARY_VERSION, image: 'x.png', input: 'data/x.png', version: '0.1.0', error: { kind: 'ImageDecode', message: 'x.png: damaged; export it again' } };
    expectValidFailedSummary(ok);
    expect(() => expectValidFailedSummary({ ...ok, error: { kind: 'ImageDecode' } })).toThrow();
    expect(() => expectValidFailedSummary({ ...ok, tessellab: 1 })).toThrow();
    expect(() => expectValidFailedSummary({ ...ok, width: 10 })).toThrow();
    const { input: _input, ...noInput } = ok;
    expect(() => expectValidFailedSummary(noInput)).toThrow();
    // A failed record is not an analysed image's summary.json, so no reader takes one for the other.
    expect(() => expectValidSummary(ok)).toThrow();
  });
});
