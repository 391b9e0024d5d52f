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

/**
 * Rows of the ASTM E112 table (grain size number G against grains per mm² at 1×, mean grain area and mean
 * lineal intercept), as recalled from memory; each value also follows from the standard's definition
 * N_AE = 2^(G−1) grains per in² at 100× (derived: N_A = 15.5·2^(G−1) per mm², Ā = 1/N_A, and the
 * intercept relation of the standard); docs/check-values.md §2 lists them with their sources. Written as text
 * so that the unit of each value's last digit is known.
 */
const rows = [
  { G: 0, NA: '7.75', A: '0.1291', l: '0.3200' },
  { G: 1, NA: '15.50', A: '0.0645', l: '0.2263' },
  { G: 5, NA: '247.97', A: '0.004033', l: '0.0566' },
  { G: 8, NA: '1983.7', A: '0.000504', l: '0.0200' },
  { G: 10, NA: '7934.9', A: '0.000126', l: '0.0100' },
  { G: 12, NA: '31740', A: '3.15e-5', l: '0.0050' },
];

/** The unit of the last written digit of a decimal literal ('0.0050' → 1e-4, '3.15e-5' → 1e-7, '31740' → 10). */
function lastDigitUnit(text: string): number {
  const [mantissa, exp] = text.toLowerCase().split('e');
  const e = exp ? Number(exp) : 0;
  const dot = mantissa!.indexOf('.');
  if (dot >= 0) return 10 ** (e - (mantissa!.length - dot - 1));
  const zeros = mantissa!.length - mantissa!.replace(/0+$/, '').length;
  return 10 ** (e + zeros);
}

/**
 * Tolerance in G for a recalled value q, so that a slip of its last digit cannot break the check: the
 * change of G caused by 2 units of that digit (G changes by `perDecade` per factor 10 of q), plus 0.01 for
 * the rounded constants of the published formulas. E.g. ℓ̄ = '0.0050' at G = 12 gets 0.12 (one unit there
 * is 2 % of ℓ̄); N_A = '1983.7' gets 0.010.
 */
function tolG(text: string, perDecade: number): number {
  const q = Number(text);
  return (perDecade * Math.log10(1 + (2 * lastDigitUnit(text)) / q)) + 0.01;
}

describe('grain size numbers from the counted quantities', () => {
  it('the last-digit unit of a literal (derived)', () => {
    expect(lastDigitUnit('0.0050')).toBeCloseTo(1e-4, 15);
    expect(lastDigitUnit('3.15e-5')).toBeCloseTo(1e-7, 20);
    expect(lastDigitUnit('31740')).toBe(10);
    expect(lastDigitUnit('1983.7')).toBeCloseTo(0.1, 12);
  });

  for (const r of rows) {
    it(`G = ${r.G} ↔ N_A = ${r.NA}/mm², Ā = ${r.A} mm², ℓ̄ = ${r.l} mm (ASTM E112 table; pub, memory; derived from its definition)`, () => {
      // Quantity → G (planimetric, mean-area and intercept relations).
      expect(Math.abs(gFromNA(Number(r.NA)) - r.G)).toBeLessThan(tolG(r.NA, 3.321928));
      expect(Math.abs(gFromMeanArea(Number(r.A)) - r.G)).toBeLessThan(tolG(r.A, 3.321928));
      expect(Math.abs(gFromMeanIntercept(Number(r.l)) - r.G)).toBeLessThan(tolG(r.l, 6.643856));
      // G → quantity, with the same tolerance expressed on the quantity.
      expect(Math.abs(3.321928 * Math.log10(naFromG(r.G) / Number(r.NA)))).toBeLessThan(tolG(r.NA, 3.321928));
      expect(Math.abs(3.321928 * Math.log10(meanAreaFromG(r.G) / Number(r.A)))).toBeLessThan(tolG(r.A, 3.321928));
      expect(Math.abs(6.643856 * Math.log10(meanInterceptFromG(r.G) / Number(r.l)))).toBeLessThan(tolG(r.l, 6.643856));
    });
  }

  it('definition N_AE = 2^(G−1) per in² at 100× (ASTM E112; pub, read in text)', () => {
    // 1 in² = 645.16 mm² (the inch is 25.4 mm by definition); at 100× it covers 645.16/10⁴ mm² of specimen.
    for (const G of [-1, 0, 3, 7, 14]) {
      const NA = 2 ** (G - 1) / (645.16 / 1e4);
      expect(gFromNA(NA)).toBeCloseTo(G, 3);
    }
  });

  it('worked example: 25 grains per in² at 75× gives G = 4.81 (textbook example, docs/check-values.md §2; pub, read in text)', () => {
    // At 75× one in² covers 645.16/75² mm² of the specimen: N_A = 25·75²/645.16 = 217.9 per mm².
    const NA = (25 * 75 ** 2) / 645.16;
    expect(Math.abs(gFromNA(NA) - 4.81)).toBeLessThan(0.01);
  });

  it('worked example: 350 mm line at 160× crossing 58 boundaries gives ℓ̄ = 0.0377 mm, G = 6.17 (textbook example, docs/check-values.md §2; pub, read in text)', () => {
    // True line length 350/160 = 2.1875 mm over 58 intercepts.
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

  it('ISO 643 index is G_ASTM − 0.046 for the same count (ISO 643; pub, memory)', () => {
    expect(Math.abs(isoFromAstm(8) - (8 - 0.046))).toBeLessThan(0.001);
    expect(Math.abs(isoFromAstm(3.5) - (3.5 - 0.046))).toBeLessThan(0.001);
    // Same N_A: ISO 643 defines m = 8·2^G_ISO grains per mm² (pub, memory).
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
  it('five values 1..5: s = 1.5811, t(0.975, 4) = 2.776 (Student t table; pub, memory), CI = t·s/√n = 1.963, %RA = 65.4 (derived)', () => {
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
    // Worked by hand (derived): mean 10, squared deviations sum to 12, s = √(12/9) = 1.1547,
    // CI = 2.262·1.1547/√10 = 0.8260, %RA = 100·CI/mean = 8.26.
    expect(p.mean).toBe(10);
    expect(Math.abs(p.sd! - 1.1547)).toBeLessThan(0.0001);
    expect(Math.abs(p.ci95! - 0.826)).toBeLessThan(0.001);
    expect(Math.abs(p.relativeAccuracyPct! - 8.26)).toBeLessThan(0.01);
  });

  it('one value has no spread; none has no mean (JSON nulls, not NaN)', () => {
    expect(precision([4])).toEqual({ n: 1, mean: 4, sd: null, t: null, ci95: null, relativeAccuracyPct: null });
    expect(precision([]).mean).toBeNull();
  });
});
