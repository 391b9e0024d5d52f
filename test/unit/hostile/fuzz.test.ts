/**
 * A bounded fuzz test: mutated PNG, JPEG, TIFF and points-CSV inputs (test/unit/hostile/fuzz.ts), a fixed
 * number of cases per kind from a fixed seed, so that every run tries the same inputs. Each input must
 * either open (and, for half of them, be analysed) or be refused with one of our typed one-line errors, the
 * file's name first when the file is what is wrong, and never an "Unexpected error". `npx tsx
 * scripts/fuzz.ts --runs N` runs the same property longer, with a random seed.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SEEDS, mutate, property, tryInput, type Outcome } from './fuzz';

const RUNS = 150;
const SEED = 20240617;

describe('fuzzed inputs: one clear line or a result, never an unexpected error', () => {
  for (const kind of Object.keys(SEEDS) as (keyof typeof SEEDS)[]) {
    it(`${RUNS} mutated ${kind.toUpperCase()} inputs`, async () => {
      const tally: Record<Outcome['result'], number> = { analysed: 0, opened: 0, refused: 0, 'not analysed': 0, defect: 0 };
      await fc.assert(property(kind, tally), { numRuns: RUNS, seed: SEED });
      expect(tally.defect).toBe(0);
      // The cases reach both sides: some inputs still open, others are refused.
      expect(tally.refused).toBeGreaterThan(0);
      expect(tally.opened + tally.analysed + tally['not analysed']).toBeGreaterThan(0);
    });
  }

  it('a quoted line break in a points header stays out of the one-line message (a case the fuzzing found)', async () => {
    // A seed that opens, unmutated, as the control.
    const png = SEEDS.png[0]!;
    expect((await tryInput('png', png.name, png.bytes, false)).result).toBe('opened');
    expect(mutate(png.bytes, [{ kind: 'byte', at: 0, value: 0 }], 8)[8]).toBe(0);
    // A points file whose first line is a header naming no x or y column, with a quoted line break inside it:
    // the message quotes that line and must stay on one line.
    const csv = new TextEncoder().encode('"a\nb",c\n1,2\n');
    const out = await tryInput('csv', 'q.csv', csv, false);
    expect(out.result).toBe('refused');
    expect(out.message).toMatch(/^q\.csv: line 1 is a header without x and y columns \(found: a b, c\)/);
  });
});
