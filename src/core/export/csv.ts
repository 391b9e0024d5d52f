/**
 * CSV writers (RFC 4180: comma-separated, CRLF line ends, fields quoted when they hold a comma, quote or
 * line break). Pure: values in, text out; the web app and the command line write the same bytes.
 */
import type { Summary } from '../summary';
import Papa from 'papaparse';
import type { Analysis } from '../analysis.types';
import { parseDecimal } from '../numbers';

/**
 * A cell made safe from formula injection. A spreadsheet opening a CSV runs a cell that starts with = + - or
 * @ (or a tab or carriage return) as a formula, e.g. a file named `=HYPERLINK(...)`. As spreadsheet
 * security guidance advises (common practice), such a cell gets a leading apostrophe, which spreadsheets
 * take as "text".
 * A number such as -1.5 or +2e-3 is left as it is: it is not a formula and must stay a number.
 *
 * @param v a cell's value
 * @returns the value, or the text with an apostrophe before it
 */
export function escapeFormula<T>(v: T): T | string {
  if (typeof v !== 'string' || !/^[=+\-@\t\r]/.test(v)) return v;
  return Number.isFinite(parseDecimal(v)) ? v : `'${v}`;
}

/** CSV text (RFC 4180) of a header and rows, every cell passed through {@link escapeFormula}. */
export function csvText(fields: string[], data: unknown[][], newline: '\r\n' | '\n' = '\r\n'): string {
  return Papa.unparse({ fields: fields.map(escapeFormula), data: data.map((row) => row.map(escapeFormula)) }, { newline }) + newline;
}

/** Formats a number for a table: integers as they are, others to 6 significant digits, NaN/∞ as empty. */
export function formatNumber(v: number): string {
  if (!Number.isFinite(v)) return '';
  if (Number.isInteger(v)) return String(v);
  return String(Number(v.toPrecision(6)));
}

/** The per-cell table: one row per cell, columns in registry order (units in the names). */
export function cellsCsv(analysis: Analysis): string {
  const names = Object.keys(analysis.columns);
  const cols = names.map((n) => analysis.columns[n]!);
  const rows: string[][] = [];
  const count = cols[0]?.length ?? 0;
  for (let i = 0; i < count; i++) rows.push(cols.map((c) => formatNumber(c[i]!)));
  return csvText(names, rows);
}

/** The flat figures of one summary as (key, value) pairs, nested keys joined with dots. */
export function flattenSummary(summary: Record<string, unknown>, prefix = '', out: [string, string][] = []): [string, string][] {
  for (const [k, v] of Object.entries(summary)) {
    const key = prefix ? `${prefix}.${k}` : k;
    if (v === null || v === undefined) out.push([key, '']);
    else if (typeof v === 'number') out.push([key, formatNumber(v)]);
    else if (typeof v === 'string' || typeof v === 'boolean') out.push([key, String(v)]);
    else if (Array.isArray(v)) continue;
    else if (typeof v === 'object') flattenSummary(v as Record<string, unknown>, key, out);
  }
  return out;
}

/** Keys of the one-row-per-image summary table, in order. */
export const SUMMARY_CSV_KEYS = [
  'width',
  'height',
  'pattern',
  'umPerPx',
  'cells.count',
  'cells.interior',
  'area.mean',
  'area.cv',
  'sides.mean',
  'sides.mu2',
  'sides.p6',
  'randomness.verdict',
  'clarkEvans.R',
  'largestGap.radius',
  'grainSize.planimetric.G',
  'grainSize.intercept.G',
  'grainSize.meanArea.G',
  'grainSize.iso643',
];

/** One row per image: the image name and the main figures of its summary. */
export function summaryCsv(rows: { name: string; summary: Summary | null; error?: string }[]): string {
  const fields = ['image', ...SUMMARY_CSV_KEYS, 'error'];
  const data = rows.map((r) => {
    const flat = new Map(r.summary ? flattenSummary(r.summary as unknown as Record<string, unknown>) : []);
    return [r.name, ...SUMMARY_CSV_KEYS.map((k) => flat.get(k) ?? ''), r.error ?? ''];
  });
  return csvText(fields, data);
}
