/**
 * A longer fuzz run than the suite's: mutated PNG, JPEG, TIFF and points-CSV inputs, opened and analysed as
 * the command line does (test/unit/hostile/fuzz.ts), with a random seed unless one is given. Prints, per
 * kind, how many inputs were tried and what became of them, and the smallest failing input if there is one.
 *
 *   npx tsx scripts/fuzz.ts [--runs N (per kind, default 2000)] [--seed S] [--kinds png,jpeg,tiff,csv]
 *
 * Exit code 1 when an input breaks the property (an unexpected error, or a message of more than one line).
 */
import fc from 'fast-check';
import { SEEDS, property, type Outcome } from '../test/unit/hostile/fuzz';

const args = process.argv.slice(2);
const opt = (name: string) => {
  const i = args.indexOf(`--${name}`);
  return i >= 0 ? args[i + 1] : undefined;
};
const runs = Number(opt('runs') ?? 2000);
const seed = Number(opt('seed') ?? Math.floor(Math.random() * 2 ** 31));
const kinds = (opt('kinds') ?? 'png,jpeg,tiff,csv').split(',') as (keyof typeof SEEDS)[];

let failed = false;
let total = 0;
const t0 = performance.now();
for (const kind of kinds) {
  const tally: Record<Outcome['result'], number> = { analysed: 0, opened: 0, refused: 0, 'not analysed': 0, defect: 0 };
  const r = await fc.check(property(kind, tally), { numRuns: runs, seed, endOnFailure: false });
  const tried = Object.values(tally).reduce((a, b) => a + b, 0);
  total += tried;
  process.stdout.write(`${kind}: ${tried} inputs tried (seed ${seed}): ${tally.opened} opened, ${tally.analysed} opened and analysed, ${tally['not analysed']} opened and refused by the analysis in one line, ${tally.refused} refused in one line, ${tally.defect} defects\n`);
  if (r.failed) {
    failed = true;
    process.stdout.write(`  smallest failing case: ${JSON.stringify(r.counterexample)}\n  ${r.errorInstance instanceof Error ? r.errorInstance.message : String(r.errorInstance)}\n`);
  }
}
process.stdout.write(`${total} inputs in ${Math.round((performance.now() - t0) / 1000)} s\n`);
process.exit(failed ? 1 : 0);
