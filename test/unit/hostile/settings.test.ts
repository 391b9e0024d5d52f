/**
 * Settings and counts as an attacker or an unlucky lab would give them: keys that reach JavaScript's
 * prototypes, unknown keys, groups given as null or a number, counts that are not whole or far too large,
 * numbers in hexadecimal, a point at 1e300. Each gets one line naming what is wrong and what to do, and
 * nothing outside the settings changes.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { main } from '../../../src/cli/main';
import { parseSize, positiveInt, positiveNumber } from '../../../src/cli/args';
import { CsvError, SettingsError, describeError } from '../../../src/core/errors';
import { parseDecimal, parseWhole } from '../../../src/core/numbers';
import { checkReferenceCounts } from '../../../src/core/reference/limits';
import { parsePointsCsv } from '../../../src/core/segment/points';
import { defaultSettings, resolveSettings } from '../../../src/core/settings';

/** Object.prototype's own names and what they hold now, to see that nothing was added or replaced. */
function prototypeSnapshot(): Map<string, unknown> {
  return new Map(Object.getOwnPropertyNames(Object.prototype).map((k) => [k, (Object.prototype as Record<string, unknown>)[k]]));
}

afterEach(() => vi.restoreAllMocks());

describe('settings: prototype keys and unknown keys', () => {
  const clean = prototypeSnapshot();
  afterEach(() => expect(prototypeSnapshot()).toEqual(clean));

  it('__proto__, constructor and prototype are refused wherever they are, naming them', () => {
    const cases: [string, RegExp][] = [
      ['{"__proto__":{"hasOwnProperty":"x"}}', /^The settings hold "__proto__", which is never a setting; remove it\.$/],
      ['{"__proto__":{"toString":1}}', /"__proto__"/],
      ['{"constructor":{"prototype":{"polluted":1}}}', /^The settings hold "constructor", which is never a setting/],
      ['{"walls":{"prototype":1,"__proto__":{"x":1}}}', /^The settings hold "walls\.prototype" and "walls\.__proto__", which are never a setting; remove them\.$/],
      ['{"field":{"x0":0,"y0":0,"x1":50,"y1":50,"__proto__":{"x":1}}}', /"field\.__proto__"/],
    ];
    for (const [json, words] of cases) {
      const input = JSON.parse(json);
      expect(() => resolveSettings(input)).toThrow(SettingsError);
      expect(() => resolveSettings(input)).toThrow(words);
    }
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it('every unknown key is named in one line, including names of Object.prototype', () => {
    const input = JSON.parse('{"wals":1,"walls":{"polarty":"dark"},"toString":1,"grain":{"hasOwnProperty":2}}');
    expect(() => resolveSettings(input)).toThrow(
      'Unknown settings "wals", "walls.polarty", "toString" and "grain.hasOwnProperty"; remove them or check the spelling.',
    );
    expect(() => resolveSettings({ field: { x0: 0, y0: 0, x1: 50, y1: 50, z: 1 } } as never)).toThrow(/^Unknown setting "field\.z"/);
  });

  it('a group given as null, a number or a list is refused by name, not an unexpected error', () => {
    for (const json of ['{"reference":null}', '{"walls":5}', '{"grain":[1]}', '{"kinetics":"fast"}']) {
      const key = Object.keys(JSON.parse(json))[0]!;
      let message = '';
      try {
        resolveSettings(JSON.parse(json));
      } catch (e) {
        message = describeError(e);
        expect(e).toBeInstanceOf(SettingsError);
      }
      expect(message).toMatch(new RegExp(`^Setting ${key} must be a group of settings in braces`));
    }
    expect(() => resolveSettings([] as never)).toThrow(/^The settings must be one JSON object in braces .*got a list/);
  });

  it('the settings written back hold the known keys only', () => {
    const s = resolveSettings({ walls: { polarity: 'dark' }, field: { x0: 0, y0: 0, x1: 30, y1: 40 } });
    expect(Object.keys(s).sort()).toEqual(Object.keys(defaultSettings()).sort());
    expect(Object.keys(s.field!)).toEqual(['x0', 'y0', 'x1', 'y1']);
  });

  it('counts are whole numbers within bounds', () => {
    expect(() => resolveSettings({ reference: { replicates: 1.5 } })).toThrow(/reference\.replicates must be a whole number from 0 to 9999; got 1\.5/);
    expect(() => resolveSettings({ reference: { replicates: 100000 } })).toThrow(/reference\.replicates must be a whole number/);
    expect(() => resolveSettings({ reference: { seed: 0.5 } })).toThrow(/reference\.seed must be a whole number/);
    expect(() => resolveSettings({ grain: { circles: 2.5 } })).toThrow(/grain\.circles must be a whole number/);
    expect(resolveSettings({ reference: { replicates: 9999 } }).reference.replicates).toBe(9999);
  });
});

describe('numbers in decimal notation only', () => {
  it('hexadecimal, binary, octal, Infinity and empty text are not numbers', () => {
    for (const t of ['0x10', '0b1', '0o7', 'Infinity', '', ' ', '1,5', '1e400', '--1', '1e', '.']) expect(parseDecimal(t)).toBeNaN();
    expect(parseDecimal(' 6.5e-1 ')).toBe(0.65);
    expect(parseDecimal('-3')).toBe(-3);
    expect(parseDecimal('.5')).toBe(0.5);
    for (const t of ['1e3', '2.0', '0x10', '-1', '']) expect(parseWhole(t)).toBeNaN();
    expect(parseWhole('+12')).toBe(12);
  });

  it('--um-per-px 0x10 and --cells 1e2 are refused, naming the option', () => {
    expect(() => positiveNumber('0x10', 'um-per-px')).toThrow('--um-per-px must be a positive number; got "0x10" (write it in decimal, e.g. 0.65 or 6.5e-1).');
    expect(positiveNumber('0.65', 'um-per-px')).toBe(0.65);
    expect(() => positiveInt('1e2', 'cells')).toThrow('--cells must be a positive whole number; got "1e2" (write it in plain digits).');
    expect(() => positiveInt('2.5', 'replicates')).toThrow(SettingsError);
  });

  it('a points CSV with 0x10 or a point at 1e300 names the line', () => {
    expect(() => parsePointsCsv('x,y\n1,2\n0x10,5\n', { name: 'hex.csv' })).toThrow(/^hex\.csv: line 3 has a value that is not a number \("0x10"\) in decimal notation/);
    const far = 'x,y\n10,10\n1e300,20\n30,40\n50,5\n';
    expect(() => parsePointsCsv(far, { name: 'far.csv' })).toThrow(CsvError);
    expect(() => parsePointsCsv(far, { name: 'far.csv' })).toThrow(/^far\.csv: line 3 has a coordinate \(1e300\) beyond ±1e\+9, far outside any image; check the units/);
  });
});

describe('reference counts', () => {
  it('cells and replicates are bounded, and so is their product', () => {
    expect(() => checkReferenceCounts(100_000_000, 199, 100, 100)).toThrow(/number of cells must be a whole number from 3 to 1000000/);
    expect(() => checkReferenceCounts(20000, 199, 100, 100)).toThrow(/20000 cells do not fit a 100 x 100 px field/);
    expect(() => checkReferenceCounts(120, 100000, 1000, 1000)).toThrow(/replicates must be a whole number from 1 to 9999/);
    expect(() => checkReferenceCounts(1_000_000, 9999, 5000, 5000)).toThrow(/use at most 200 replicates for this many cells/);
    expect(() => checkReferenceCounts(120.5, 19, 100, 100)).toThrow(SettingsError);
    expect(() => checkReferenceCounts(120, 199, 100, 100)).not.toThrow();
  });
});

describe('the command line with hostile settings and counts', () => {
  async function run(args: string[]): Promise<{ code: number; err: string; out: string }> {
    let err = '';
    let out = '';
    vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => ((err += String(s)), true));
    vi.spyOn(process.stdout, 'write').mockImplementation((s: string | Uint8Array) => ((out += String(s)), true));
    const code = await main(args);
    vi.restoreAllMocks();
    return { code, err, out };
  }
  const dir = mkdtempSync(join(tmpdir(), 'tessellab-hostile-'));

  it('a settings file with __proto__ gives one line and exit 1, and leaves Object.prototype alone', async () => {
    const before = prototypeSnapshot();
    const f = join(dir, 'evil.json');
    writeFileSync(f, '{"__proto__":{"hasOwnProperty":"x","toString":1}}');
    const r = await run(['analyze', join(dir, 'nothing.png'), '--settings', f, '--out', join(dir, 'o')]);
    expect(r.code).toBe(1);
    expect(r.err).toBe('tessellab analyze: The settings hold "__proto__", which is never a setting; remove it.\n');
    expect(prototypeSnapshot()).toEqual(before);
  });

  it('--um-per-px 0x10 and 1e308 are refused before any file is read', async () => {
    const hex = await run(['analyze', join(dir, 'nothing.png'), '--um-per-px', '0x10', '--out', join(dir, 'o')]);
    expect(hex.code).toBe(1);
    expect(hex.err).toMatch(/^tessellab analyze: --um-per-px must be a positive number; got "0x10" \(write it in decimal/);
    const huge = await run(['analyze', join(dir, 'nothing.png'), '--um-per-px', '1e308', '--out', join(dir, 'o')]);
    expect(huge.code).toBe(1);
    expect(huge.err).toMatch(/^tessellab analyze: The pixel size 1e\+308 µm\/px is outside the plausible range .*\(1e-5 to 1e4 µm\/px\)/);
  });

  it('kinetics with a settings file that is not JSON names the file; a size beyond 1e9 px is refused', async () => {
    const f = join(dir, 'broken.json');
    writeFileSync(f, '{"kinetics": ');
    const r = await run(['kinetics', join(dir, 'a.png'), join(dir, 'b.png'), join(dir, 'c.png'), '--times', '1,2,3', '--settings', f]);
    expect(r.code).toBe(1);
    expect(r.err).toBe(`tessellab kinetics: The settings file ${f} is not valid JSON; fix it or leave out --settings.\n`);
    expect(() => parseSize('2000000000x5')).toThrow('--size must be at most 1000000000x1000000000 px; got "2000000000x5".');
    expect(parseSize('1000000000x5')).toEqual([1e9, 5]);
  });

  it('reference --cells 100000000 --size 100x100, fractional and huge counts: one line each, nothing drawn', async () => {
    const cases: [string[], RegExp][] = [
      [['--cells', '100000000', '--size', '100x100'], /number of cells must be a whole number from 3 to 1000000; got 100000000/],
      [['--cells', '120', '--size', '100x100', '--replicates', '100000'], /replicates must be a whole number from 1 to 9999/],
      [['--cells', '120.5', '--size', '100x100'], /--cells must be a positive whole number; got "120\.5" \(write it in plain digits\)/],
      [['--cells', '120', '--size', '100x100', '--replicates', '1e3'], /--replicates must be a positive whole number/],
      [['--cells', '120', '--size', '100x100', '--seed', '0x10'], /--seed must be a whole number/],
    ];
    for (const [args, words] of cases) {
      const r = await run(['reference', ...args]);
      expect(r.code).toBe(1);
      expect(r.out).toBe('');
      expect(r.err.trim().split('\n')).toHaveLength(1);
      expect(r.err).toMatch(words);
    }
  });
});
