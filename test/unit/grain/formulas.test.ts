import { describe, expect, it } from 'vitest';
import {
  formatG,
  gFromMeanArea,
  gFromMeanIntercept,
  gFromNA,
  isoFromAstm,
  meanAreaFromG,
  meanInterceptFromG,
  naFromG,
  precision,
} from '../../../src/core/grain/index';

// Table rows of docs/check-values.md section 2 (derived from the ASTM E112 formulas; they match the standard's table as recalled).
const rows = [
  { G: 0, NA: 7.75, A: 0.1291, l: 0.32 },
  { G: 1, NA: 15.5, A: 0.0645, l: 0.2263 },
  { G: 5, NA: 247.97, A: 0.004033, l: 0.0566 },
  { G: 8, NA: 1983.7, A: 0.000504, l: 0.02 },
  { G: 10, NA: 7934.9, A: 0.000126, l: 0.01 },
  { G: 12, NA: 31740, A: 3.15e-5, l: 0.005 },
];

describe('grain size numbers from the counted quantities', () => {
  for (const r of rows) {
    it(`G = ${r.G} from N_A, ℓ̄ and Ā (docs/check-values.md §2 table rows; derived)`, () => {
      expect(Math.abs(gFromNA(r.NA) - r.G)).toBeLessThan(0.01);
      expect(Math.abs(gFromMeanIntercept(r.l) - r.G)).toBeLessThan(0.01);
      expect(Math.abs(gFromMeanArea(r.A) - r.G)).toBeLessThan(0.01);
    });
  }

  it('definition N_AE = 2^(G−1) per in² at 100× (ASTM E112; pub, read in text)', () => {
    // 1 in² at 100× is 645.16e-4 mm² of specimen.
    for (const G of [-1, 0, 3, 7, 14]) {
      const NA = 2 ** (G - 1) / (645.16 / 1e4);
      expect(gFromNA(NA)).toBeCloseTo(G, 3);
    }
  });

  it('worked example: 25 grains per in² at 75× gives G = 4.81 (docs/check-values.md §2; pub, read in text)', () => {
    // At 75× one in² covers 645.16/75² mm² of the specimen.
    const NA = 25 / (645.16 / 75 ** 2);
    expect(Math.abs(gFromNA(NA) - 4.81)).toBeLessThan(0.01);
  });

  it('worked example: 350 mm line at 160× crossing 58 boundaries gives ℓ̄ = 0.0377 mm, G = 6.17 (docs/check-values.md §2; pub, read in text)', () => {
    const l = 350 / 160 / 58;
    expect(Math.abs(l - 0.0377)).toBeLessThan(0.00005);
    expect(Math.abs(gFromMeanIntercept(l) - 6.17)).toBeLessThan(0.01);
  });

  it('inverse functions return the input (derived)', () => {
    for (const G of [-1, 0, 4.3, 9.7, 14]) {
      expect(gFromNA(naFromG(G))).toBeCloseTo(G, 9);
      expect(gFromMeanIntercept(meanInterceptFromG(G))).toBeCloseTo(G, 9);
      expect(gFromMeanArea(meanAreaFromG(G))).toBeCloseTo(G, 9);
    }
  });

  it('ISO 643 index is G − 0.046 for the same count (ISO 643 m = 8·2^G; pub, memory)', () => {
    expect(Math.abs(isoFromAstm(8) - 7.954)).toBeLessThan(0.001);
    // Same N_A: ISO 643 m = 8·2^G_ISO.
    const NA = 500;
    expect(isoFromAstm(gFromNA(NA))).toBeCloseTo(Math.log2(NA / 8), 2);
  });

  it('G is written to 0.1 and −1 as 00 (ASTM E112 table; pub, read in text)', () => {
    expect(formatG(7.249)).toBe('7.2');
    expect(formatG(7.251)).toBe('7.3');
    expect(formatG(-1.02)).toBe('00');
    expect(formatG(-0.02)).toBe('0.0');
  });
});

describe('precision: mean, s, t-based 95 % CI and %RA (ASTM E112 statistics section)', () => {
  it('five values 1..5: s = 1.5811, t(0.975, 4) = 2.776, CI = 1.963, %RA = 65.4 (Student t table; pub, memory)', () => {
    const p = precision([1, 2, 3, 4, 5]);
    expect(p.n).toBe(5);
    expect(p.mean).toBe(3);
    expect(p.sd!).toBeCloseTo(Math.sqrt(2.5), 10);
    expect(Math.abs(p.t! - 2.776)).toBeLessThan(0.001);
    expect(Math.abs(p.ci95! - 1.963)).toBeLessThan(0.002);
    expect(Math.abs(p.relativeAccuracyPct! - 65.4)).toBeLessThan(0.1);
  });

  it('t(0.975, 9) = 2.262 for ten fields (Student t table; pub, memory)', () => {
    const p = precision([10, 11, 9, 10, 12, 8, 10, 11, 9, 10]);
    expect(Math.abs(p.t! - 2.262)).toBeLessThan(0.001);
    // %RA = 100·CI/mean by definition (derived).
    expect(p.relativeAccuracyPct!).toBeCloseTo((100 * p.ci95!) / p.mean!, 10);
  });

  it('one value has no spread; none has no mean (JSON nulls, not NaN)', () => {
    expect(precision([4])).toEqual({ n: 1, mean: 4, sd: null, t: null, ci95: null, relativeAccuracyPct: null });
    expect(precision([]).mean).toBeNull();
  });
});
