/**
 * Benchmark of the tessellation and the random-seeding reference. Run: npx tsx test/bench/reference.bench.ts
 * Prints the best of a few runs of each (the machine is shared; the best run is the least disturbed one),
 * wall clock and CPU time.
 * An argument keeps only the lines whose label contains it: npx tsx test/bench/reference.bench.ts reference
 */
import Delaunator from 'delaunator';
import { tessellate, tessellateCells } from '../../src/core/tessellate';
import { clearReferenceCache, referenceMonteCarlo } from '../../src/core/reference/montecarlo';
import { seedPoints } from '../../src/core/synth/seeds';
import { mulberry32 } from '../../src/core/random';

/** Best wall-clock and best CPU time (user + system, this process) of `runs` runs, in ms. */
function best(runs: number, f: () => void): [number, number] {
  let b = Infinity;
  let c = Infinity;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    const u0 = process.cpuUsage();
    f();
    const u = process.cpuUsage(u0);
    b = Math.min(b, performance.now() - t0);
    c = Math.min(c, (u.user + u.system) / 1000);
  }
  return [b, c];
}

const filter = process.argv[2] ?? '';
const wanted = (label: string) => label.includes(filter);
// CPU time beside the wall clock: on a loaded machine the wall clock also counts the waits for a core.
const line = (label: string, [ms, cpu]: [number, number]) =>
  process.stdout.write(`${label.padEnd(58)} ${ms.toFixed(0).padStart(7)} ms  (cpu ${cpu.toFixed(0).padStart(6)} ms)\n`);
const run = (label: string, runs: number, f: () => void) => {
  if (wanted(label)) line(label, best(runs, f));
};

for (const [n, runs] of [[10_000, 5], [100_000, 3], [1_000_000, 2]] as const) {
  if (!wanted(`tessellate, ${n} random points`) && !wanted(`tessellateCells (no polygons), ${n} random points`)) continue;
  const side = Math.sqrt(n) * 10;
  const p = seedPoints(n, side, side, 'random', 1);
  const f = { x0: 0, y0: 0, x1: side, y1: side };
  run(`tessellate, ${n} random points`, runs, () => tessellate(p, f));
  run(`tessellateCells (no polygons), ${n} random points`, runs, () => tessellateCells(p, f));
}
// The window layout of 12 000 cells in 4096 x 4096 px draws about 14 400 seeds (field plus guard band).
for (const [count, runs] of [[3000, 3], [14400, 2]] as const) {
  const label = `Delaunator alone, 199 x ${count} points (the floor)`;
  if (!wanted(label)) continue;
  const rng = mulberry32(1);
  const sets = Array.from({ length: 199 }, () => {
    const q = new Float64Array(2 * count);
    for (let i = 0; i < 2 * count; i++) q[i] = rng() * 2000;
    return q;
  });
  run(label, runs, () => sets.forEach((s) => new Delaunator(s)));
}
const field = { x0: 0, y0: 0, x1: 2000, y1: 2000 };
// Cold runs (cache: false) measure the drawing; the last line a re-analysis that finds the reference cached.
run('reference, 199 replicates, 3000 cells, seeds layout', 3, () => referenceMonteCarlo({ cells: 3000, field, replicates: 199, seed: 1, edgeRule: 'exclude', cache: false }));
run('reference, 199 replicates, 3000 cells, window layout', 3, () => referenceMonteCarlo({ cells: 3000, field, replicates: 199, seed: 1, edgeRule: 'exclude', layout: 'window', cache: false }));
// A 16-megapixel walls image (4096 x 4096 px) holds about 12 000 cells.
const big = { x0: 0, y0: 0, x1: 4096, y1: 4096 };
run('reference, 199 replicates, 12000 cells, window layout', 2, () => referenceMonteCarlo({ cells: 12000, field: big, replicates: 199, seed: 1, edgeRule: 'exclude', layout: 'window', cache: false }));
if (wanted('reference, 3000 cells, window layout, cached')) {
  clearReferenceCache();
  referenceMonteCarlo({ cells: 3000, field, replicates: 199, seed: 1, edgeRule: 'exclude', layout: 'window' });
  run('reference, 3000 cells, window layout, cached', 3, () => referenceMonteCarlo({ cells: 3000, field, replicates: 199, seed: 1, edgeRule: 'exclude', layout: 'window' }));
}
