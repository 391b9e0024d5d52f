/** The per-cell table's pure parts: column order, sorting, and the window of rows to render. */
import type { Columns } from '../core/types';

/**
 * Row order (0-based cell indices) sorted by one column; ties keep cell order, NaN sorts last.
 * @param cols the analysis columns
 * @param key column name, or null for cell order
 */
export function sortedRows(cols: Columns, n: number, key: string | null, descending: boolean): Int32Array {
  const idx = new Int32Array(n);
  for (let i = 0; i < n; i++) idx[i] = i;
  const c = key ? cols[key] : undefined;
  if (!c) { if (descending) idx.reverse(); return idx; }
  const dir = descending ? -1 : 1;
  idx.sort((a, b) => {
    const va = c[a]!, vb = c[b]!;
    const na = Number.isNaN(va), nb = Number.isNaN(vb);
    if (na || nb) return na === nb ? a - b : na ? 1 : -1;
    return va === vb ? a - b : (va < vb ? -1 : 1) * dir;
  });
  return idx;
}

/** The rows to render for a scroll position: [first, last) with `overscan` extra rows each side. */
export function visibleWindow(scrollTop: number, viewport: number, rowHeight: number, total: number, overscan = 8): [number, number] {
  const first = Math.min(total, Math.max(0, Math.floor(scrollTop / rowHeight) - overscan));
  const last = Math.min(total, Math.ceil((scrollTop + viewport) / rowHeight) + overscan);
  return [first, Math.max(first, last)];
}
