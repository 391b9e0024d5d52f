/**
 * Benchmark of the tessellation and the random-seeding reference. Run: npx tsx test/bench/reference.bench.ts
 * Prints the best of a few runs of each (the machine is shared; the best run is the least disturbed one).
 */
import Delaunator from 'delaunator';
import { tessellate, tessellateCells } from '../../src/core/tessellate';
import { referenceMonteCarlo } from '../../src/core/reference/montecarlo';
import { seedPoints } from '../../src/core/synth/seeds';
import { mulberry32 } from '../../src/core/random';

function best(runs: number, f: () => void): number {
  let b = Infinity;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    f();
    b = Math.min(b, performance.now() - t0);
  }
  return b;
}

const line = (label: string, ms: number) => process.stdout.write(`${label.padEnd(58)} ${ms.toFixed(0).padStart(7)} ms\n`);

for (const [n, runs] of [[10_000, 5], [100_000, 3], [1_000_000, 2]] as const) {
  const side = Math.sqrt(n) * 10;
  const p = seedPoints(n, side, side, 'random', 1);
  const f = { x0: 0, y0: 0, x1: side, y1: side };
  line(`tessellate, ${n} random points`, best(runs, () => tessellate(p, f)));
  line(`tessellateCells (no polygons), ${n} random points`, best(runs, () => tessellateCells(p, f)));
}
{
  const rng = mulberry32(1);
  const sets = Array.from({ length: 199 }, () => {
    const q = new Float64Array(6000);
    for (let i = 0; i < 6000; i++) q[i] = rng() * 2000;
    return q;
  });
  line('Delaunator alone, 199 x 3000 points (the floor)', best(3, () => sets.forEach((s) => new Delaunator(s))));
}
const field = { x0: 0, y0: 0, x1: 2000, y1: 2000 };
line('reference, 199 replicates, 3000 cells, seeds layout', best(3, () => referenceMonteCarlo({ cells: 3000, field, replicates: 199, seed: 1, edgeRule: 'exclude' })));
line('reference, 199 replicates, 3000 cells, window layout', best(3, () => referenceMonteCarlo({ cells: 3000, field, replicates: 199, seed: 1, edgeRule: 'exclude', layout: 'window' })));
