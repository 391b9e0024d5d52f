/**
 * Seed point sets for synthetic patterns and for tests of the randomness statistics: random, regular
 * (hard-core) and clustered, each with exactly n points in a width x height field, deterministic from a seed.
 */
import { SettingsError } from '../errors';
import { mulberry32, normal, type Rng } from '../random';

/** How the seeds of a synthetic pattern are placed. */
export type SeedOrder = 'random' | 'regular' | 'clustered';

/** Tuning of the regular and clustered processes; the defaults are what `seedPoints` uses. */
export interface SeedOptions {
  /**
   * Hard-core distance of 'regular' as a fraction of the hexagonal-lattice spacing at the same density,
   * d_hex = sqrt(2 / (sqrt(3) * lambda)). Default 0.7: disks of that diameter cover 44 % of the plane, below
   * the 54.7 % at which random sequential adsorption jams (Feder 1980, J. Theor. Biol. 87:237; pub, memory),
   * so n points always fit. 0.8 would need 58 % and cannot be reached by sequential adsorption.
   */
  minDistanceFactor?: number;
  /** Mean number of points per cluster of 'clustered' (default 8). */
  clusterSize?: number;
  /** Standard deviation of the offspring displacement of 'clustered', as a fraction of the mean spacing 1/sqrt(lambda) (default 0.25). */
  clusterSpread?: number;
}

/** The minimum distance (px) that 'regular' seeds keep for n points in a width x height field. */
export function hardCoreDistance(n: number, width: number, height: number, factor = 0.7): number {
  const lambda = n / (width * height);
  return factor * Math.sqrt(2 / (Math.sqrt(3) * lambda));
}

/**
 * n seed points in [0, width) x [0, height), interleaved x, y in px.
 *
 * - 'random': n independent uniform points (the binomial process, i.e. a Poisson process conditioned on n).
 * - 'regular': random sequential adsorption of hard disks: uniform candidates are accepted only if no
 *   accepted point is closer than d = minDistanceFactor * d_hex (see {@link hardCoreDistance}); a grid
 *   of cell d/sqrt(2) holds at most one point per cell, so each check looks at 5 x 5 cells.
 *   (Widom 1966, J. Chem. Phys. 44:3888; Feder 1980; pub, memory.) Should candidates run out (more than
 *   1000 n failed attempts in a row) d is lowered by 5 % and adsorption goes on, so n is always reached.
 * - 'clustered': a Thomas process conditioned on n points: round(n / clusterSize) parents uniform in the
 *   field; each point picks a parent uniformly and is displaced by an isotropic normal offset of sd
 *   clusterSpread / sqrt(lambda); offsets that leave the field are drawn again.
 *   (Thomas 1949, Biometrika 36:18; pub, memory.)
 *
 * @param n number of points (>= 1)
 * @param width field width (px)
 * @param height field height (px)
 * @param order the process
 * @param seed seed of the generator (src/core/random.ts)
 */
export function seedPoints(n: number, width: number, height: number, order: SeedOrder, seed: number, opts: SeedOptions = {}): Float64Array {
  if (!Number.isInteger(n) || n < 1) throw new SettingsError(`The number of seeds must be a positive whole number; got ${n}.`);
  if (!(width > 0) || !(height > 0) || !Number.isFinite(width) || !Number.isFinite(height)) {
    throw new SettingsError(`The field must have a positive width and height; got ${width} x ${height}.`);
  }
  const rng = mulberry32(seed);
  switch (order) {
    case 'random':
      return uniformPoints(rng, n, width, height);
    case 'regular':
      return hardCorePoints(rng, n, width, height, opts.minDistanceFactor ?? 0.7);
    case 'clustered':
      return clusteredPoints(rng, n, width, height, opts.clusterSize ?? 8, opts.clusterSpread ?? 0.25);
    default:
      throw new SettingsError(`Seed order must be random, regular or clustered; got "${String(order)}".`);
  }
}

/** n uniform points in [0, width) x [0, height), interleaved x, y. */
export function uniformPoints(rng: Rng, n: number, width: number, height: number): Float64Array {
  const out = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    out[2 * i] = rng() * width;
    out[2 * i + 1] = rng() * height;
  }
  return out;
}

function hardCorePoints(rng: Rng, n: number, width: number, height: number, factor: number): Float64Array {
  if (!(factor > 0 && factor <= 1)) throw new SettingsError(`minDistanceFactor must be in (0, 1]; got ${factor}.`);
  const out = new Float64Array(2 * n);
  let d = hardCoreDistance(n, width, height, factor);
  let count = 0;
  for (;;) {
    const cell = d / Math.SQRT2;
    const gw = Math.max(1, Math.ceil(width / cell));
    const gh = Math.max(1, Math.ceil(height / cell));
    const grid = new Int32Array(gw * gh).fill(-1);
    const d2 = d * d;
    // Re-index the points already accepted (after a lowering of d, they still satisfy the smaller d).
    for (let i = 0; i < count; i++) {
      const gx = Math.min(gw - 1, Math.floor(out[2 * i]! / cell));
      const gy = Math.min(gh - 1, Math.floor(out[2 * i + 1]! / cell));
      grid[gy * gw + gx] = i;
    }
    let fails = 0;
    const maxFails = 1000 * n;
    while (count < n && fails < maxFails) {
      const x = rng() * width;
      const y = rng() * height;
      const gx = Math.min(gw - 1, Math.floor(x / cell));
      const gy = Math.min(gh - 1, Math.floor(y / cell));
      let ok = grid[gy * gw + gx] === -1;
      for (let yy = Math.max(0, gy - 2); ok && yy <= Math.min(gh - 1, gy + 2); yy++) {
        for (let xx = Math.max(0, gx - 2); xx <= Math.min(gw - 1, gx + 2); xx++) {
          const j = grid[yy * gw + xx]!;
          if (j < 0) continue;
          const dx = out[2 * j]! - x;
          const dy = out[2 * j + 1]! - y;
          if (dx * dx + dy * dy < d2) {
            ok = false;
            break;
          }
        }
      }
      if (!ok) {
        fails++;
        continue;
      }
      grid[gy * gw + gx] = count;
      out[2 * count] = x;
      out[2 * count + 1] = y;
      count++;
      fails = 0;
    }
    if (count === n) return out;
    d *= 0.95;
  }
}

function clusteredPoints(rng: Rng, n: number, width: number, height: number, clusterSize: number, spread: number): Float64Array {
  if (!(clusterSize >= 1)) throw new SettingsError(`clusterSize must be at least 1; got ${clusterSize}.`);
  if (!(spread > 0)) throw new SettingsError(`clusterSpread must be positive; got ${spread}.`);
  const parents = Math.max(1, Math.round(n / clusterSize));
  const centres = uniformPoints(rng, parents, width, height);
  const sd = spread / Math.sqrt(n / (width * height));
  const out = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    const p = Math.min(parents - 1, Math.floor(rng() * parents));
    const cx = centres[2 * p]!;
    const cy = centres[2 * p + 1]!;
    let x: number;
    let y: number;
    let tries = 0;
    do {
      x = cx + sd * normal(rng);
      y = cy + sd * normal(rng);
      // A parent in a corner of a tiny field could keep missing; fall back to a uniform point.
      if (++tries > 100) {
        x = rng() * width;
        y = rng() * height;
      }
    } while (x < 0 || x >= width || y < 0 || y >= height);
    out[2 * i] = x;
    out[2 * i + 1] = y;
  }
  return out;
}
