import { describe, it, expect, vi, afterEach } from 'vitest';
import { command } from '../../../src/cli/commands/reference';
import { SettingsError } from '../../../src/core/errors';

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
    const r = await run(['--cells', '300', '--size', '400x300', '--replicates', '19', '--seed', '7']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.reference.replicates).toBe(19);
    expect(j.reference.seed).toBe(7);
    expect(j.reference.field).toEqual({ x0: 0, y0: 0, x1: 400, y1: 300 });
    expect(j.reference.statistics.mu2.mean).toBeGreaterThan(1.3);
    expect(j.published.sidesVariance.value).toBeCloseTo(1.781, 3);
  });
  it('the same seed prints the same reference', async () => {
    const a = JSON.parse((await run(['--cells', '100', '--size', '200x200', '--replicates', '9'])).out);
    const b = JSON.parse((await run(['--cells', '100', '--size', '200x200', '--replicates', '9'])).out);
    expect(a.reference).toEqual(b.reference);
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
