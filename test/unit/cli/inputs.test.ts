/**
 * The inputs of a batch (src/cli/inputs.ts): list files, the shard option, one sorted list without repeats,
 * distinct output names for inputs with the same stem, and shards that are disjoint and together complete.
 * Checked against the options' documented behaviour (docs/batches.md); nothing here is a measurement.
 */
import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { SettingsError } from '../../../src/core/errors';
import { parseList, parseShard, planInputs, readList, shardOf } from '../../../src/cli/inputs';

describe('list files', () => {
  it('one path per line, LF or CRLF, blank lines skipped, spaces inside a path kept', () => {
    expect(parseList('a.png\r\nsub dir/b.tif\n\n  \nc.png')).toEqual(['a.png', 'sub dir/b.tif', 'c.png']);
    expect(parseList('')).toEqual([]);
  });

  it('"-" reads standard input; a missing list file is a clear error', async () => {
    expect(await readList('-', Readable.from([Buffer.from('x.png\ny'), Buffer.from('.png\n')]))).toEqual(['x.png', 'y.png']);
    await expect(readList('/no/such/list.txt')).rejects.toThrow(/The list \/no\/such\/list\.txt \(--files-from\) does not exist/);
  });
});

describe('--shard', () => {
  it('reads I/N with 1 ≤ I ≤ N and refuses anything else with the form it wants', () => {
    expect(parseShard('2/8')).toEqual({ index: 2, count: 8 });
    expect(parseShard(' 1 / 1 ')).toEqual({ index: 1, count: 1 });
    for (const bad of ['0/4', '5/4', '1/0', '2', 'a/b', '1.5/3', '-1/3']) {
      expect(() => parseShard(bad)).toThrow(SettingsError);
      expect(() => parseShard(bad)).toThrow(/--shard must look like 2\/8/);
    }
  });

  it('N shards are disjoint and together the whole sorted list, whatever the order the list was given in', () => {
    const paths = Array.from({ length: 23 }, (_, i) => `img/${String(i).padStart(3, '0')}.png`);
    const shuffled = [...paths].sort((a, b) => (a.charCodeAt(5) * 7 + a.charCodeAt(6) * 13) % 11 - (b.charCodeAt(5) * 7 + b.charCodeAt(6) * 13) % 11);
    for (const count of [1, 2, 3, 5, 23, 40]) {
      const plan = planInputs(shuffled);
      const parts = Array.from({ length: count }, (_, i) => shardOf(plan.inputs, { index: i + 1, count }).map((x) => x.path));
      const all = parts.flat();
      expect(new Set(all).size).toBe(all.length);
      expect([...all].sort()).toEqual(paths);
      // The same split from a list given in another order (another machine's listing).
      const again = planInputs([...paths].reverse());
      expect(Array.from({ length: count }, (_, i) => shardOf(again.inputs, { index: i + 1, count }).map((x) => x.path))).toEqual(parts);
    }
  });
});

describe('one list, each input once, distinct names', () => {
  it('a.png a.tif sub/a.png: three names, the first in sorted order keeping the stem, and a note for each other', () => {
    const plan = planInputs(['sub/a.png', 'a.tif', 'a.png']);
    expect(plan.inputs).toEqual([
      { path: 'a.png', name: 'a' },
      { path: 'a.tif', name: 'a-2' },
      { path: 'sub/a.png', name: 'a-3' },
    ]);
    expect(plan.notes).toEqual([
      'a.tif: its name is also that of a.png; its files are named a-2.*',
      'sub/a.png: its name is also that of a.png; its files are named a-3.*',
    ]);
  });

  it('a new name never takes the stem of another input, and letter case does not keep names apart', () => {
    const plan = planInputs(['a.png', 'a.tif', 'a-2.png', 'A.jpg']);
    const names = plan.inputs.map((x) => x.name.toLowerCase());
    expect(new Set(names).size).toBe(4);
    expect(plan.inputs.find((x) => x.path === 'a-2.png')!.name).toBe('a-2');
    expect(plan.inputs.find((x) => x.path === 'A.jpg')!.name).toBe('A');
    expect(plan.inputs.filter((x) => x.path !== 'A.jpg' && x.path !== 'a-2.png').map((x) => x.name)).toEqual(['a-3', 'a-4']);
  });

  it('a path given twice (also as ./path) is analysed once, with a note', () => {
    const plan = planInputs(['x/b.png', './x/b.png', 'x//b.png', 'c.png']);
    expect(plan.inputs.map((x) => x.path)).toEqual(['c.png', 'x/b.png']);
    expect(plan.notes).toHaveLength(2);
    expect(plan.notes[0]).toMatch(/given more than once; analysed once/);
  });
});
