import { describe, expect, it } from 'vitest';
import { CsvError, SeriesError } from '../../../src/core/errors';
import { parseTimesCsv, parseTimesList, timesFromNames } from '../../../src/core/kinetics/index';

describe('frame times', () => {
  it('typed list', () => {
    expect(parseTimesList('0, 30,60 ;90\n120')).toEqual([0, 30, 60, 90, 120]);
    expect(() => parseTimesList('1, two, 3')).toThrow(/Time 2 \("two"\) is not a number/);
    expect(() => parseTimesList(' ')).toThrow(SeriesError);
  });

  it('CSV of file,time with or without a header; pages of a multi-page file in order or by [page]', () => {
    const csv = 'file,time\ndir/a.png,10\nb.png,20\nc.png,35\n';
    expect(parseTimesCsv(csv, ['/x/a.png', 'b.png', 'c.png'])).toEqual([10, 20, 35]);
    expect(parseTimesCsv('stack.tif,1\nstack.tif,2\nstack.tif,4', ['stack.tif[1]', 'stack.tif[2]', 'stack.tif[3]'])).toEqual([1, 2, 4]);
    expect(parseTimesCsv('stack.tif[2],5\nstack.tif[1],3', ['stack.tif[1]', 'stack.tif[2]'])).toEqual([3, 5]);
    expect(() => parseTimesCsv(csv, ['a.png', 'd.png'])).toThrow(/no time for frame 2 \(d.png\)/);
    expect(() => parseTimesCsv('a.png,10\nb.png,soon', ['a.png', 'b.png'])).toThrow(CsvError);
  });

  it('numbers in the file names', () => {
    expect(timesFromNames(['run2_t005.png', 'run2_t010.png', 'run2_t12.5.png'])).toEqual([5, 10, 12.5]);
    expect(() => timesFromNames(['a.png', 'b2.png'])).toThrow(/frame 1 \(a.png\) holds no number/);
    expect(() => timesFromNames(['s.tif[1]', 's.tif[2]'])).toThrow(SeriesError);
  });
});
