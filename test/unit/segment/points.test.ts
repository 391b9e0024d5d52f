import { describe, expect, it } from 'vitest';
import { CsvError } from '../../../src/core/errors';
import { parsePointsCsv } from '../../../src/core/segment/points';

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
});
