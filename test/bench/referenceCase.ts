/**
 * The random-seeding reference alone, in its own process: the app's default (199 replicates) for 3 000
 * cells in both layouts and for the 16 MP image's 12 577 cells, drawn afresh (cache off) with the command
 * line's worker threads and on one thread; median of the runs after a warm-up. Prints one JSON line.
 * Run by test/bench/run.ts as: node --import tsx/esm test/bench/referenceCase.ts '<runs>'
 */
import type { ReferenceOptions } from '../../src/core/reference/montecarlo';
import { startReference } from '../../src/core/reference/parallel';
import { sharedReferencePool } from '../../src/node/referencePool';

export interface ReferenceCaseResult {
  id: string;
  label: string;
  threads: number;
  medianMs: number;
  runsMs: number[];
}

export const REFERENCE_CASES: { id: string; label: string; opts: ReferenceOptions }[] = [
  { id: 'seeds-3000', label: '199 replicates x 3 000 cells, seeds layout (points, bodies), 2000² px', opts: { cells: 3000, field: { x0: 0, y0: 0, x1: 2000, y1: 2000 }, replicates: 199, seed: 1, edgeRule: 'exclude', cache: false } },
  { id: 'window-3000', label: '199 replicates x 3 000 cells, window layout (walls), 2000² px', opts: { cells: 3000, field: { x0: 0, y0: 0, x1: 2000, y1: 2000 }, replicates: 199, seed: 1, edgeRule: 'exclude', layout: 'window', minCellAreaPx: 20, cache: false } },
  { id: 'window-12577', label: '199 replicates x 12 577 cells, window layout (the 16 MP image)', opts: { cells: 12577, field: { x0: 0, y0: 0, x1: 4096, y1: 4096 }, replicates: 199, seed: 1, edgeRule: 'exclude', layout: 'window', minCellAreaPx: 20, cache: false } },
];

const median = (v: number[]): number => {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

async function main(): Promise<void> {
  const runs = Number(process.argv[2] ?? 5);
  const pool = sharedReferencePool();
  const out: ReferenceCaseResult[] = [];
  for (const c of REFERENCE_CASES) {
    for (const p of [pool, null]) {
      const times: number[] = [];
      for (let r = 0; r <= runs; r++) {
        const t0 = performance.now();
        await startReference(c.opts, p).result();
        if (r > 0) times.push(performance.now() - t0);
      }
      out.push({ id: c.id, label: c.label, threads: p ? p.size + 1 : 1, medianMs: median(times), runsMs: times });
    }
  }
  process.stdout.write(`${JSON.stringify(out)}\n`);
  await pool.close();
}

await main();
