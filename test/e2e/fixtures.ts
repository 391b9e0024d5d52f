/** Test images made by the project's own generator, written to a temporary folder for upload. */
import { synthesize } from '../../src/core/synth/index';
import { encodePng } from '../../src/core/image/encode';
import { seedPoints } from '../../src/core/synth/seeds';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export interface Fixture { name: string; path: string; bytes: Uint8Array }

/** A walls pattern of `cells` random seeds as an 8-bit grey PNG. */
export function wallsPng(cells: number, width: number, height: number, seed: number, dir = mkdtempSync(join(tmpdir(), 'tessellab-fx-'))): Fixture {
  const s = synthesize({ pattern: 'walls', cells, width, height, order: 'random', seed });
  const bytes = encodePng({ width, height, data: s.image.data as Uint8Array, channels: 1, bitDepth: 8 });
  const name = `walls-${cells}-${seed}.png`;
  const path = join(dir, name);
  writeFileSync(path, bytes);
  return { name, path, bytes };
}

/** A file that claims to be a PNG but is cut short after its header. */
export function corruptPng(dir = mkdtempSync(join(tmpdir(), 'tessellab-fx-'))): Fixture {
  const good = wallsPng(30, 128, 96, 7, dir).bytes;
  const bytes = good.slice(0, 60);
  const name = 'broken.png';
  const path = join(dir, name);
  writeFileSync(path, bytes);
  return { name, path, bytes };
}

/** A points CSV (x,y in px) of n uniform random seeds in a width x height field. */
export function pointsCsv(n: number, width: number, height: number, seed: number, dir = mkdtempSync(join(tmpdir(), 'tessellab-fx-'))): Fixture {
  const p = seedPoints(n, width, height, 'random', seed);
  const lines = ['x,y'];
  for (let i = 0; i < p.length; i += 2) lines.push(`${p[i]!.toFixed(3)},${p[i + 1]!.toFixed(3)}`);
  const bytes = new TextEncoder().encode(lines.join('\n') + '\n');
  const name = `points-${n}-${seed}.csv`;
  const path = join(dir, name);
  writeFileSync(path, bytes);
  return { name, path, bytes };
}
