import { describe, it, expect, vi, afterEach } from 'vitest';
import { command } from '../../../src/cli/commands/reference';
import { SettingsError } from '../../../src/core/errors';
import { clearReferenceCache } from '../../../src/core/reference/montecarlo';

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const o = vi.spyOn(process.stdout, 'write').mockImplementation((s: string | Uint8Array) => ((out += String(s)), true));
  const e = vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => ((err += String(s)), true));
  try {
    const code = await command.run(args);
    return { code, out, err };
  } finally {
    o.mockRestore();
    e.mockRestore();
  }
}

describe('tessellab reference', () => {
  afterEach(() => vi.restoreAllMocks());
  it('prints the reference and the published constants as JSON', async () => {
    const r = await run(['--cells', '300', '--size', '400x300', '--replicates', '19', '--seed', '7', '--values']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    // What was drawn from the options: 19 replicate values of each statistic; 300 seeds per replicate at
    // 300 / (400·300) = 0.0025 per px² (derived: the seeds layout draws the observed count in the field).
    expect(j.reference.statistics.mu2.values).toHaveLength(19);
    expect(j.reference.seedsPerReplicate).toBe(300);
    expect(j.reference.densityPerPx2).toBeCloseTo(0.0025, 12);
    // μ₂ of Poisson–Voronoi cells is 1.781 (Brakke 1987; Hilhorst 2007; pub, memory); interior cells of a
    // small field have fewer many-sided cells, so only a loose lower bound here.
    expect(j.reference.statistics.mu2.mean).toBeGreaterThan(1.3);
    // The published constant printed beside it is that value.
    expect(j.published.sidesVariance.value).toBeCloseTo(1.781, 3);
  });
  it('the same seed prints the same reference, another seed another one', async () => {
    // The reference cache is emptied before each run, so that each run draws (the same process would
    // otherwise print its cached reference again).
    const print = async (args: string[]) => {
      clearReferenceCache();
      return JSON.parse((await run(['--cells', '100', '--size', '200x200', '--replicates', '9', ...args])).out);
    };
    const a = await print([]);
    const b = await print([]);
    const c = await print(['--seed', '2']);
    expect(a.reference).toEqual(b.reference);
    expect(c.reference.statistics).not.toEqual(a.reference.statistics);
  });
  it('bad options get a message that names them', async () => {
    await expect(run(['--size', '400x300'])).rejects.toThrow(/--cells is required/);
    await expect(run(['--cells', '300', '--size', '400by300'])).rejects.toThrow(SettingsError);
    await expect(run(['--cells', '300', '--size', '400x300', '--replicates', '0'])).rejects.toThrow(/--replicates must be a positive whole number/);
    await expect(run(['--cells', '300', '--size', '400x300', '--edge-rule', 'drop'])).rejects.toThrow(/--edge-rule must be exclude or weight/);
  });
  it('a field too small for its replicates: warnings on stderr, JSON still printed', async () => {
    const r = await run(['--cells', '12', '--size', '10x10', '--replicates', '19']);
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/too small/);
    expect(JSON.parse(r.out).reference.warnings.length).toBeGreaterThan(0);
  });
});
