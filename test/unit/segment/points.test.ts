import { describe, expect, it } from 'vitest';
import { CsvError } from '../../../src/core/errors';
import { mergeCoincidentPoints, parsePointsCsv } from '../../../src/core/segment/points';

describe('points CSV', () => {
  it('reads a header with x and y in any column order, and headerless pairs', () => {
    const a = parsePointsCsv('id,y,x\n1,2.5,10\n2,3,11\n');
    expect(Array.from(a.points)).toEqual([10, 2.5, 11, 3]);
    expect([a.xColumn, a.yColumn]).toEqual(['x', 'y']);
    const b = parsePointsCsv('1\t2\n3\t4\n');
    expect(Array.from(b.points)).toEqual([1, 2, 3, 4]);
    const c = parsePointsCsv('\uFEFFx_um;y_um\r\n1;2\r\n\r\n3;4\r\n');
    expect(Array.from(c.points)).toEqual([1, 2, 3, 4]);
  });
  it('names the line of a bad value, counting blank lines', () => {
    expect(() => parsePointsCsv('x,y\n1,2\n\n3,abc\n', { name: 'p.csv' })).toThrow(/p\.csv: line 4 has a value that is not a number \("abc"\)/);
    expect(() => parsePointsCsv('x,y\n1,2\n3\n')).toThrow(/line 3 is missing y/);
    expect(() => parsePointsCsv('a,b\n1,2\n')).toThrow(/header without x and y/);
    expect(() => parsePointsCsv('')).toThrow(CsvError);
    expect(() => parsePointsCsv('x,y\n')).toThrow(/header but no points/);
  });
  it('merges points that repeat an earlier line, and says how many and where the first is', () => {
    // Hand-made: 6 lines, of which line 4 repeats line 2 and line 7 repeats line 3 (blank line 5 counted);
    // "-0" and "0" are the same number.
    const text = 'x,y\n1,2\n3,4\n1,2\n\n5,6\n3,4.0\n0,7\n-0,7\n';
    const p = parsePointsCsv(text, { name: 'dup.csv' });
    expect(Array.from(p.points)).toEqual([1, 2, 3, 4, 5, 6, 0, 7]);
    expect(p.count).toBe(4);
    expect(p.duplicates).toBe(3);
    expect(p.warnings).toEqual(['dup.csv: 3 duplicated points (the same x and y as an earlier line, first at line 4) merged; 4 distinct points of 7 are analysed.']);
    // Kept on request (events), with no warning.
    const k = parsePointsCsv(text, { duplicates: 'keep' });
    expect(k.count).toBe(7);
    expect(k.duplicates).toBe(0);
    expect(k.warnings).toEqual([]);
    // No duplicates: no warning, the same array.
    const none = parsePointsCsv('1,2\n3,4\n');
    expect(none.warnings).toEqual([]);
    expect(none.duplicates).toBe(0);
    const one = parsePointsCsv('1,2\n1,2\n3,4\n');
    expect(one.warnings[0]).toMatch(/^1 duplicated point \(.*first at line 2\) merged; 2 distinct points of 3 are analysed\.$/);
  });

  it('mergeCoincidentPoints keeps the first of each group, in order', () => {
    const m = mergeCoincidentPoints(Float64Array.from([5, 5, 1, 1, 5, 5, 5, 6, 1, 1, 5, 5]));
    expect(Array.from(m.points)).toEqual([5, 5, 1, 1, 5, 6]);
    expect(m.duplicates).toBe(3);
    expect(m.firstDuplicate).toBe(2);
  });
});
