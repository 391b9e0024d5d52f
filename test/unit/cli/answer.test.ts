/**
 * `tessellab analyse` is `tessellab analyze`, and both print the answer for each image on stdout: the cell
 * count, the verdict with its p-value and the grain size number, the same figures summary.json holds.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { main } from '../../../src/cli/main';
import { encodePng } from '../../../src/core/image/encode';
import { synthesize } from '../../../src/core/synth/index';

async function run(args: string[]): Promise<{ code: number; out: string }> {
  let out = '';
  const e = vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
  const o = vi.spyOn(process.stdout, 'write').mockImplementation((s: string | Uint8Array) => ((out += String(s)), true));
  try {
    return { code: await main(args), out };
  } finally {
    e.mockRestore();
    o.mockRestore();
  }
}

describe('tessellab analyse', () => {
  it('runs as analyze does and prints the answer: cells, verdict with p, G', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'tessellab-answer-'));
    const s = synthesize({ pattern: 'walls', cells: 120, width: 400, height: 300, order: 'random', seed: 9 });
    const img = join(dir, 'g.png');
    writeFileSync(img, encodePng({ width: 400, height: 300, data: s.image.data as Uint8Array, channels: 1, bitDepth: 8 }));
    const settings = join(dir, 's.json');
    writeFileSync(settings, JSON.stringify({ reference: { replicates: 19 } }));
    const a = await run(['analyse', img, '--um-per-px', '0.5', '--settings', settings, '--out', join(dir, 'a')]);
    const b = await run(['analyze', img, '--um-per-px', '0.5', '--settings', settings, '--out', join(dir, 'b')]);
    expect(a.code).toBe(0);
    expect(b.code).toBe(0);
    expect(a.out).toBe(b.out);
    const sum = JSON.parse(readFileSync(join(dir, 'a', 'g.summary.json'), 'utf8')) as {
      cells: { count: number }; randomness: { verdict: string | null; basis: { pValue: number } }; grainSize: { G: number };
    };
    expect(readFileSync(join(dir, 'b', 'g.summary.json'), 'utf8')).toBe(readFileSync(join(dir, 'a', 'g.summary.json'), 'utf8'));
    const line = a.out.trim();
    expect(line.split('\n')).toHaveLength(1);
    expect(line).toMatch(new RegExp(`^g\\.png: ${sum.cells.count} cells; `));
    expect(sum.randomness.verdict).not.toBeNull();
    expect(line).toContain(`${sum.randomness.verdict} (p = `);
    expect(line).toMatch(new RegExp(`; G = ${sum.grainSize.G.toFixed(1).replace('.', '\\.')}$`));
  });
});
