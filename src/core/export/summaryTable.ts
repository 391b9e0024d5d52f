/**
 * summary.csv: one row per input of a batch, made from the per-image summary.json files (the command line's
 * analyze and merge both write it with this). Every input has a row: an analysed image its figures, an input
 * that failed its reason. Units travel in the column names, and px and µm never share a column: a figure
 * with a length or an area has one column per unit (`area.mean_um2` and `area.mean_px2`), and each row
 * fills the one of its own units, so a batch of calibrated and uncalibrated images reads correctly.
 * Pure: parsed JSON in, text out.
 */
import Papa from 'papaparse';
import { formatNumber } from './csv';

/** What a figure's value is measured in: px (always), the summary's length or area unit, per its area unit, or nothing. */
type UnitKind = 'px' | 'length' | 'area' | 'perArea' | null;

interface Figure {
  /** Dotted path in summary.json. */
  key: string;
  /** The column's name without its unit (default: the key). */
  name?: string;
  unit: UnitKind;
}

/** The figures of the table, in column order (the keys are summary.json's, README "Files written"). */
const FIGURES: readonly Figure[] = [
  { key: 'width', unit: 'px' },
  { key: 'height', unit: 'px' },
  { key: 'pattern', unit: null },
  { key: 'umPerPx', unit: null },
  { key: 'calibration.source', unit: null },
  { key: 'cells.count', unit: null },
  { key: 'cells.interior', unit: null },
  { key: 'cells.inStatistics', unit: null },
  { key: 'cells.densityPerArea', name: 'cells.density', unit: 'perArea' },
  { key: 'area.mean', unit: 'area' },
  { key: 'area.cv', unit: null },
  { key: 'sides.mean', unit: null },
  { key: 'sides.mu2', unit: null },
  { key: 'sides.p6', unit: null },
  { key: 'quality.ok', unit: null },
  { key: 'randomness.verdict', unit: null },
  { key: 'clarkEvans.R', unit: null },
  { key: 'largestGap.radius', unit: 'length' },
  { key: 'grainSize.planimetric.G', unit: null },
  { key: 'grainSize.intercept.G', unit: null },
  { key: 'grainSize.meanArea.G', unit: null },
  { key: 'grainSize.iso643', unit: null },
];

const SUFFIXES: Record<Exclude<UnitKind, null | 'px'>, { um: string; px: string }> = {
  length: { um: '_um', px: '_px' },
  area: { um: '_um2', px: '_px2' },
  perArea: { um: '_per_um2', px: '_per_px2' },
};

/** The columns after the figures: whether the input was analysed, why not, which input, which version. */
const TRAILING = ['status', 'error.kind', 'error.message', 'input', 'version'] as const;

/** The table's header: `image`, the figures with their units, then {@link TRAILING}. */
export function summaryTableColumns(): string[] {
  const cols = ['image'];
  for (const f of FIGURES) {
    const name = f.name ?? f.key;
    if (f.unit === null) cols.push(name);
    else if (f.unit === 'px') cols.push(`${name}_px`);
    else cols.push(name + SUFFIXES[f.unit].um, name + SUFFIXES[f.unit].px);
  }
  return [...cols, ...TRAILING];
}

const get = (o: unknown, path: string): unknown => path.split('.').reduce<unknown>((v, k) => (v !== null && typeof v === 'object' ? (v as Record<string, unknown>)[k] : undefined), o);

function cell(v: unknown): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return formatNumber(v);
  if (typeof v === 'string' || typeof v === 'boolean') return String(v);
  return '';
}

/** Whether a parsed summary.json is the failed kind (src/core/summary.ts FailedSummary). */
export function isFailedSummary(s: unknown): boolean {
  const e = get(s, 'error');
  return e !== null && typeof e === 'object' && get(s, 'width') === undefined;
}

/** The summary's unit system: 'um' when it is calibrated, else 'px' (summary.json `units.length`). */
function unitsOf(s: unknown): 'um' | 'px' {
  const u = get(s, 'units.length');
  if (u === 'um' || u === 'px') return u;
  return typeof get(s, 'umPerPx') === 'number' ? 'um' : 'px';
}

/** One row of the table from a parsed summary.json (complete or failed). */
export function summaryTableRow(s: unknown): string[] {
  const failed = isFailedSummary(s);
  const row = [cell(get(s, 'image'))];
  const units = unitsOf(s);
  for (const f of FIGURES) {
    const v = failed ? '' : cell(get(s, f.key));
    if (f.unit === null || f.unit === 'px') row.push(v);
    else row.push(units === 'um' ? v : '', units === 'px' ? v : '');
  }
  row.push(failed ? 'failed' : 'analysed', cell(get(s, 'error.kind')), cell(get(s, 'error.message')), cell(get(s, 'input')), cell(get(s, 'version')));
  return row;
}

/** summary.csv (RFC 4180, CRLF, as the other tables) from rows of {@link summaryTableRow}, in the order given. */
export function summaryTableText(rows: readonly string[][]): string {
  return Papa.unparse({ fields: summaryTableColumns(), data: rows as string[][] }, { newline: '\r\n' }) + '\r\n';
}

/** summary.csv from parsed summary.json objects (complete or failed), in the order given. */
export function summaryTable(summaries: readonly unknown[]): string {
  return summaryTableText(summaries.map(summaryTableRow));
}
