/**
 * summary.csv of a batch (src/core/export/summaryTable.ts): a row for every input, units in the column
 * names and px and µm never in one column, and the failed input's reason. The table is read back with
 * Python's standard csv module (an RFC 4180 reader outside the project) when python3 is there.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyze } from '../../../src/core/analyze';
import { summaryTable, summaryTableColumns } from '../../../src/core/export/summaryTable';
import { SUMMARY_VERSION, type FailedSummary } from '../../../src/core/summary';
import { synthesize } from '../../../src/core/synth/index';

function hasPython(): boolean {
  try {
    execFileSync('python3', ['--version']);
    return true;
  } catch {
    return false;
  }
}

/** Rows of a CSV as Python's csv module reads them. */
function pythonRows(text: string): string[][] {
  const py = 'import csv, io, json, sys; print(json.dumps(list(csv.reader(io.StringIO(sys.stdin.read(), newline="")))))';
  return JSON.parse(execFileSync('python3', ['-c', py], { input: text }).toString()) as string[][];
}

describe('summary.csv of a batch', async () => {
  const img = synthesize({ pattern: 'walls', cells: 120, width: 300, height: 240, order: 'random', seed: 5 }).image;
  const settings = { reference: { replicates: 19 } };
  const px = (await analyze({ kind: 'image', image: img }, settings)).summary;
  const um = (await analyze({ kind: 'image', image: img }, { ...settings, umPerPx: 0.5 }, { calibrationSource: 'file' })).summary;
  const failed: FailedSummary = { tessellab: SUMMARY_VERSION, image: 'bad, "odd".png', input: 'in/bad, "odd".png', version: '9.9.9', error: { kind: 'ImageDecode', message: 'bad.png: the file is damaged; export it again' } };
  const rows = [
    { ...um, image: 'um.png', input: 'in/um.png', version: '9.9.9' },
    { ...px, image: 'px.png', input: 'in/px.png', version: '9.9.9' },
    failed,
  ];
  const text = summaryTable(rows);
  const header = summaryTableColumns();

  it('every dimensioned column names its unit, in µm or px, and each has its pair in the other unit', () => {
    const suffix = /_(um|px|um2|px2|per_um2|per_px2)$/;
    const withUnit = header.filter((h) => suffix.test(h));
    expect(withUnit).toEqual(expect.arrayContaining(['width_px', 'height_px', 'area.mean_um2', 'area.mean_px2', 'largestGap.radius_um', 'largestGap.radius_px', 'cells.density_per_um2', 'cells.density_per_px2']));
    for (const h of withUnit.filter((x) => /_(um|um2|per_um2)$/.test(x))) expect(header).toContain(h.replace(/um(2?)$/, 'px$1'));
    expect(header.slice(-5)).toEqual(['status', 'error.kind', 'error.message', 'input', 'version']);
    expect(header).toContain('calibration.source');
  });

  it('docs/names.md lists exactly these columns, in order', () => {
    const names = readFileSync('docs/names.md', 'utf8');
    const section = names.slice(names.indexOf('## Columns of summary.csv'));
    const listed = [...section.slice(0, section.indexOf('A figure with')).matchAll(/`([^`]+)`/g)].map((m) => m[1]);
    expect(listed).toEqual(header);
  });

  it('a calibrated and an uncalibrated image fill the columns of their own unit only, with their own values', () => {
    const col = (name: string) => header.indexOf(name);
    const table = (hasPython() ? pythonRows(text) : text.trimEnd().split('\r\n').map((l) => l.split(','))).slice(1);
    const [rUm, rPx] = table;
    expect(rUm![col('area.mean_px2')]).toBe('');
    expect(rPx![col('area.mean_um2')]).toBe('');
    expect(rUm![col('largestGap.radius_px')]).toBe('');
    expect(rPx![col('largestGap.radius_um')]).toBe('');
    // The same cells: areas scale with the square of the pixel size, lengths with it (derived from the definition of µm/px).
    expect(Number(rUm![col('area.mean_um2')]) / Number(rPx![col('area.mean_px2')])).toBeCloseTo(0.25, 4);
    expect(Number(rUm![col('largestGap.radius_um')]) / Number(rPx![col('largestGap.radius_px')])).toBeCloseTo(0.5, 4);
    expect(Number(rPx![col('cells.density_per_px2')]) / Number(rUm![col('cells.density_per_um2')])).toBeCloseTo(0.25, 4);
    expect(rUm![col('calibration.source')]).toBe('file');
    expect(rPx![col('calibration.source')]).toBe('none');
    expect(rUm![col('umPerPx')]).toBe('0.5');
    expect(rPx![col('umPerPx')]).toBe('');
    // Pixel sizes of the image, whatever the calibration.
    expect([rUm![col('width_px')], rPx![col('height_px')]]).toEqual(['300', '240']);
    expect(rPx![col('cells.count')]).toBe(String(px.cells.count));
    expect(rUm![col('status')]).toBe('analysed');
    expect(rUm![col('input')]).toBe('in/um.png');
    expect(rUm![col('version')]).toBe('9.9.9');
  });

  it.runIf(hasPython())('a failed input is a row with its reason; commas and quotes survive (RFC 4180, read by Python csv)', () => {
    const t = pythonRows(text);
    expect(t).toHaveLength(4);
    for (const r of t) expect(r).toHaveLength(header.length);
    const f = t[3]!;
    expect(f[0]).toBe('bad, "odd".png');
    expect(f[header.indexOf('status')]).toBe('failed');
    expect(f[header.indexOf('error.kind')]).toBe('ImageDecode');
    expect(f[header.indexOf('error.message')]).toBe('bad.png: the file is damaged; export it again');
    expect(f[header.indexOf('input')]).toBe('in/bad, "odd".png');
    expect(f.slice(1, header.indexOf('status')).every((v) => v === '')).toBe(true);
    expect(text.endsWith('\r\n')).toBe(true);
  });
});
