/**
 * CSV formula injection: a cell of summary.csv or kinetics.csv that starts with = + - or @ (a file named
 * `=HYPERLINK(...)`, an error message that starts with that name) runs as a formula when a spreadsheet
 * opens the file. Such text gets a leading apostrophe, as spreadsheet security guidance advises (common
 * practice); numbers such as -1.5 stay numbers. The CSV is read back with papaparse (a general-purpose CSV
 * reader).
 */
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { escapeFormula, summaryCsv } from '../../../src/core/export/csv';
import { kineticsCsv } from '../../../src/core/export/kinetics';
import { analyzeSeries, simulateGrowth } from '../../../src/core/kinetics/index';
import type { Summary } from '../../../src/core/summary';

const evil = '=HYPERLINK("q?leak="&A1,"open").png';

describe('escapeFormula', () => {
  it('text that starts with = + - @, a tab or a carriage return gets an apostrophe', () => {
    for (const t of ['=1+1', '+cmd', '-2+3', '@SUM(A1)', '\t=1', '\r=1', '-', '+', '=']) expect(escapeFormula(t)).toBe(`'${t}`);
  });
  it('numbers and other text are left alone', () => {
    for (const t of ['-1.5', '+2e-3', '-0', '-1E+300', 'cells', '', '1=1', 'a@b']) expect(escapeFormula(t)).toBe(t);
    expect(escapeFormula(-1.5)).toBe(-1.5);
    expect(escapeFormula(null)).toBeNull();
  });
});

describe('summary.csv', () => {
  it('a file named =HYPERLINK(...) and its error message are text, not formulas', () => {
    const text = summaryCsv([{ name: evil, summary: null, error: `${evil}: the file is empty (0 bytes); choose the image file again` }]);
    const rows = Papa.parse<string[]>(text.trim()).data;
    expect(rows[1]![0]).toBe(`'${evil}`);
    expect(rows[1]![rows[1]!.length - 1]).toBe(`'${evil}: the file is empty (0 bytes); choose the image file again`);
    for (const row of rows) for (const cell of row) expect(cell).not.toMatch(/^[=+@]/);
  });

  it('negative figures stay numbers', () => {
    const summary = { width: 100, height: 80, pattern: 'walls', umPerPx: 500, grainSize: { planimetric: { G: -1.5 }, intercept: { G: -2.25 }, meanArea: { G: -1 }, iso643: -1.55 } } as unknown as Summary;
    const rows = Papa.parse<string[]>(summaryCsv([{ name: 'coarse.png', summary }]).trim()).data;
    const header = rows[0]!;
    const row = rows[1]!;
    expect(row[header.indexOf('grainSize.planimetric.G')]).toBe('-1.5');
    expect(row[header.indexOf('grainSize.intercept.G')]).toBe('-2.25');
    expect(row[header.indexOf('grainSize.iso643')]).toBe('-1.55');
  });
});

describe('kinetics.csv', () => {
  it('a frame named @SUM(...) is text; times and fractions stay numbers', async () => {
    const times = [0, 10, 20, 30, 40];
    const sim = simulateGrowth({ width: 96, height: 96, mode: 'site-saturation', density: 3e-3, speed: 0.5, times, seed: 4 });
    const r = await analyzeSeries(sim.frames, times, {}, { timeUnit: 's' });
    r.frames[0]!.source = '@SUM(1+1)*cmd|calc.png';
    r.frames[1]!.source = '-10.png';
    const rows = Papa.parse<string[]>(kineticsCsv(r).trim()).data;
    expect(rows[1]![1]).toBe("'@SUM(1+1)*cmd|calc.png");
    expect(rows[2]![1]).toBe("'-10.png");
    expect(Number(rows[3]![2])).toBe(20);
    for (const row of rows.slice(1)) expect(Number.isFinite(Number(row[3]))).toBe(true);
  });
});
