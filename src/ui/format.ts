/** Number formatting for tables and tooltips. */

/** A cell value for display: ids, counts and flags as integers, other values to 4 significant digits. */
export function formatValue(v: number | undefined, column: string): string {
  if (v === undefined || Number.isNaN(v)) return '–';
  if (column === 'cell' || column === 'neighbours' || column === 'voronoi_sides' || column === 'edge' || column === 'events') return String(Math.round(v));
  if (!Number.isFinite(v)) return String(v);
  const a = Math.abs(v);
  if (a !== 0 && (a >= 1e6 || a < 1e-3)) return v.toExponential(3);
  return Number(v.toPrecision(4)).toString();
}

/** A p-value for display. */
export function formatP(p: number): string {
  if (!Number.isFinite(p)) return '–';
  if (p < 0.001) return '< 0.001';
  return p.toFixed(3);
}
