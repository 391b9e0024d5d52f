/**
 * The answer `tessellab analyze` prints for each image once it is written: the cell count, the verdict
 * with the combined test's p-value (or "not rated" with the reason), and the grain size number when
 * there is one. Read from the summary only.
 */
import type { Summary } from '../core/summary';

/** One line: "NAME: N cells; VERDICT (p = P); G = X". */
export function answerLine(name: string, s: Summary): string {
  const parts = [`${s.cells.count} cells`];
  const r = s.randomness;
  if (!s.quality.ok) parts.push(`not rated (${s.quality.warnings[0] ?? 'the quality check failed'})`);
  else if (r.verdict) parts.push(`${r.verdict}${r.basis.pValue !== null ? ` (p = ${r.basis.pValue < 0.001 ? '< 0.001' : r.basis.pValue.toFixed(3)})` : ''}`);
  else parts.push(r.verdictText);
  const g = s.grainSize;
  if (g && g.G !== null && Number.isFinite(g.G)) parts.push(`G = ${g.G.toFixed(1)}`);
  else if (s.pattern === 'walls' && s.umPerPx === null) parts.push('G needs the pixel size (--um-per-px)');
  return `${name}: ${parts.join('; ')}`;
}
