/**
 * The benchmark's inputs, made by the project's own generator: walls and bodies images (written once as
 * PNG under bench-results/inputs/, so that decoding is timed like a real file and the generator's own
 * memory stays out of the measured process) and uniform random point sets.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { encodePng } from '../../src/core/image/encode';
import { synthesize, type SynthOptions } from '../../src/core/synth/index';
import { seedPoints } from '../../src/core/synth/seeds';

/** Cells per megapixel of the walls images (the issue's "about 750 cells per megapixel"). */
export const CELLS_PER_MP = 750;

/** One benchmark case. */
export type BenchCase =
  | { id: string; kind: 'image'; label: string; synth: SynthOptions; settings: Record<string, unknown> }
  | { id: string; kind: 'points'; label: string; n: number; side: number; settings: Record<string, unknown> };

function wallsCase(side: number, settings: Record<string, unknown> = {}, suffix = ''): BenchCase {
  const mp = (side * side) / 1e6;
  return {
    id: `walls-${side}${suffix}`,
    kind: 'image',
    label: `walls ${side}² (${mp.toFixed(1)} MP)${suffix ? `, ${suffix.replace(/^-/, '').replace(/-/g, ' ')}` : ''}`,
    synth: { pattern: 'walls', cells: Math.round(CELLS_PER_MP * mp), width: side, height: side, order: 'random', seed: 1 },
    settings: { umPerPx: 0.5, ...settings },
  };
}

/**
 * The default cases: walls at about 1, 4 and 16 MP (default settings, so the full random-seeding reference
 * of 199 replicates runs), the 16 MP image again without the Monte Carlo reference (to show the rest of the
 * job alone), a 4 MP bodies image, and 10^4, 10^5, 10^6 random points (reference off: 199 tessellations of
 * a million points are a batch job of their own).
 */
export function defaultCases(): BenchCase[] {
  const cases: BenchCase[] = [wallsCase(1024), wallsCase(2048), wallsCase(4096)];
  cases.push(wallsCase(4096, { reference: { replicates: 0 } }, '-reference-off'));
  cases.push({
    id: 'bodies-2048',
    kind: 'image',
    label: 'bodies 2048² (4.2 MP)',
    synth: { pattern: 'bodies', cells: 1500, width: 2048, height: 2048, order: 'regular', seed: 1 },
    settings: { pattern: 'bodies', umPerPx: 0.5 },
  });
  for (const n of [10_000, 100_000, 1_000_000]) {
    cases.push({
      id: `points-${n}`,
      kind: 'points',
      label: `${n.toLocaleString('en-US')} points, reference off`,
      n,
      side: Math.round(Math.sqrt(n) * 10),
      settings: { pattern: 'points', reference: { replicates: 0 } },
    });
  }
  return cases;
}

/** A hash of the generator's sources: a cached image is remade whenever the generator changes. */
function generatorHash(root: string): string {
  const h = createHash('sha256');
  const dir = join(root, 'src/core/synth');
  for (const f of readdirSync(dir).sort()) h.update(readFileSync(join(dir, f)));
  return h.digest('hex').slice(0, 10);
}

/**
 * The PNG file of an image case, generating it on first use.
 * @returns the path and whether it was generated now
 */
export function imageFile(root: string, c: Extract<BenchCase, { kind: 'image' }>): { path: string; made: boolean } {
  const dir = join(root, 'bench-results/inputs');
  mkdirSync(dir, { recursive: true });
  const s = c.synth;
  const path = join(dir, `${s.pattern}-${s.width}x${s.height}-${s.cells}-${s.order}-s${s.seed}-${generatorHash(root)}.png`);
  if (existsSync(path)) return { path, made: false };
  const r = synthesize(s);
  writeFileSync(path, encodePng({ width: r.image.width, height: r.image.height, data: r.image.data as Uint8Array, channels: 1, bitDepth: 8 }));
  return { path, made: true };
}

/** The point set of a points case: n uniform points in a side x side px field, seed 1. */
export function pointSet(c: Extract<BenchCase, { kind: 'points' }>): Float64Array {
  return seedPoints(c.n, c.side, c.side, 'random', 1);
}
