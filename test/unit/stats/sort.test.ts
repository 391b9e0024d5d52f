/**
 * The radix sort of positive doubles gives exactly Float64Array.prototype.sort's result (ECMA-262, TypedArray
 * sort without a comparator: ascending numeric order; the reference here is that built-in), on samples shaped
 * like the normalised areas it sorts, on ties, on values spanning many binary exponents, and it hands values
 * it does not take (zero, negatives, NaN, infinities) to the built-in sort.
 */
import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../../../src/core/random';
import { sortPositive } from '../../../src/core/stats/sort';

function check(values: Float64Array): void {
  const expected = values.slice().sort();
  const got = values.slice();
  sortPositive(got);
  expect(Array.from(got)).toEqual(Array.from(expected));
}

describe('sortPositive', () => {
  const rnd = mulberry32(21);
  it('gamma-like normalised areas (12 000 values): same order as the built-in sort', () => {
    check(Float64Array.from({ length: 12000 }, () => -Math.log(rnd()) * 0.4 + rnd() * 0.6 + 1e-3));
  });
  it('many ties (values on a coarse grid)', () => {
    check(Float64Array.from({ length: 5000 }, () => 1 + Math.floor(rnd() * 20) / 4));
  });
  it('values spanning 1e-300 to 1e300 and subnormals', () => {
    check(Float64Array.from({ length: 4000 }, () => 10 ** (rnd() * 600 - 300) * (rnd() < 0.01 ? 1e-20 : 1)));
    check(Float64Array.from({ length: 1000 }, () => rnd() * 4e-320 + 5e-324));
  });
  it('a second call reuses its working array and is still right; a shorter array after a longer one too', () => {
    check(Float64Array.from({ length: 3000 }, () => rnd() * 9 + 0.5));
    check(Float64Array.from({ length: 700 }, () => rnd() * 2 + 0.1));
  });
  it('a subarray is sorted in place without touching the rest of its buffer', () => {
    const buf = Float64Array.from({ length: 1200 }, (_, i) => (i < 100 || i >= 1100 ? -7 : rnd() + 0.25));
    const mid = buf.subarray(100, 1100);
    const expected = mid.slice().sort();
    sortPositive(mid);
    expect(Array.from(mid)).toEqual(Array.from(expected));
    expect(buf[99]).toBe(-7);
    expect(buf[1100]).toBe(-7);
  });
  for (const [name, bad] of [['zero', 0], ['a negative value', -1], ['NaN', Number.NaN], ['Infinity', Number.POSITIVE_INFINITY]] as const) {
    it(`${name} among the values: the built-in sort's result`, () => {
      const v = Float64Array.from({ length: 600 }, () => rnd() + 0.1);
      v[17] = bad;
      check(v);
    });
  }
});
