/**
 * Failures across the worker boundary (src/app/wire.ts): each typed error the core throws keeps its kind
 * (src/core/errors.ts) and its message as plain data that survives structured cloning.
 */
import { describe, expect, it } from 'vitest';
import { isWireError, toWireError, UNEXPECTED, withWireErrors } from '../../../src/app/wire';
import { CancelledError, TessellabError } from '../../../src/core/errors';
import { decodeImage } from '../../../src/core/image/decode';
import { parseTimesList } from '../../../src/core/kinetics/index';
import { parsePointsCsv } from '../../../src/core/segment/points';
import { resolveSettings } from '../../../src/core/settings';

async function thrown(f: () => unknown): Promise<unknown> {
  try {
    await f();
  } catch (e) {
    return e;
  }
  throw new Error('expected a failure');
}

describe('toWireError', () => {
  it('keeps the kind and message of the typed errors the core throws', async () => {
    const cases: [() => unknown, string][] = [
      [() => parsePointsCsv('', { name: 'p.csv' }), 'Csv'],
      [() => decodeImage(new TextEncoder().encode('plain text, no image'), { name: 'x.png' }), 'ImageDecode'],
      [() => resolveSettings({ umPerPx: -1 }), 'Calibration'],
      [() => parseTimesList(''), 'Series'],
      [() => { throw new CancelledError(); }, 'Cancelled'],
    ];
    for (const [f, kind] of cases) {
      const e = await thrown(f);
      expect(e).toBeInstanceOf(TessellabError);
      const w = toWireError(e);
      expect(w).toEqual({ kind, message: (e as Error).message });
      expect(w.message.length).toBeGreaterThan(10);
      // Plain data: a structured clone (what postMessage does) is the same object, unlike an Error's.
      expect(structuredClone(w)).toEqual(w);
      expect(isWireError(structuredClone(w))).toBe(true);
    }
  });

  it('names anything else unexpected, with its text', () => {
    expect(toWireError(new TypeError('x is undefined'))).toEqual({ kind: UNEXPECTED, message: 'Unexpected error: x is undefined' });
    expect(toWireError(42)).toEqual({ kind: UNEXPECTED, message: 'Unexpected error: 42' });
  });

  it('tells a wire error from an Error and from other values', () => {
    expect(isWireError({ kind: 'Csv', message: 'm' })).toBe(true);
    expect(isWireError(new CancelledError())).toBe(false);
    expect(isWireError({ kind: 'Csv' })).toBe(false);
    expect(isWireError(null)).toBe(false);
  });
});

describe('withWireErrors', () => {
  const api = withWireErrors({
    async fails() { throw new CancelledError(); },
    throwsNow(): number { throw new TypeError('bad'); },
    async works(x: number) { return { x: x * 2 }; },
    plain(x: number) { return x + 1; },
  });

  it('turns a rejection and a throw into wire errors of their kind', async () => {
    await expect(api.fails()).rejects.toEqual({ kind: 'Cancelled', message: 'The analysis was cancelled.' });
    expect(() => api.throwsNow()).toThrow(expect.objectContaining({ kind: UNEXPECTED }));
  });

  it('passes results through unchanged', async () => {
    await expect(api.works(4)).resolves.toEqual({ x: 8 });
    expect(api.plain(1)).toBe(2);
  });
});
