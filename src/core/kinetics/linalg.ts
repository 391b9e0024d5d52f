/** Small dense linear algebra for the few-parameter fits (row-major square matrices). */

/**
 * Solves A·x = b by Gaussian elimination with partial pivoting. A is n×n row-major (not modified).
 * Returns null when A is singular to working precision.
 */
export function solve(A: Float64Array, b: Float64Array, n: number): Float64Array | null {
  const M = Float64Array.from(A);
  const x = Float64Array.from(b);
  let scale = 0;
  for (let i = 0; i < n * n; i++) scale = Math.max(scale, Math.abs(M[i]!));
  if (!(scale > 0)) return null;
  for (let c = 0; c < n; c++) {
    let piv = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(M[r * n + c]!) > Math.abs(M[piv * n + c]!)) piv = r;
    if (Math.abs(M[piv * n + c]!) <= 1e-14 * scale) return null;
    if (piv !== c) {
      for (let j = 0; j < n; j++) {
        const t = M[c * n + j]!;
        M[c * n + j] = M[piv * n + j]!;
        M[piv * n + j] = t;
      }
      const t = x[c]!;
      x[c] = x[piv]!;
      x[piv] = t;
    }
    for (let r = c + 1; r < n; r++) {
      const f = M[r * n + c]! / M[c * n + c]!;
      if (f === 0) continue;
      for (let j = c; j < n; j++) M[r * n + j] = M[r * n + j]! - f * M[c * n + j]!;
      x[r] = x[r]! - f * x[c]!;
    }
  }
  for (let r = n - 1; r >= 0; r--) {
    let s = x[r]!;
    for (let j = r + 1; j < n; j++) s -= M[r * n + j]! * x[j]!;
    x[r] = s / M[r * n + r]!;
  }
  return x;
}

/** The inverse of an n×n row-major matrix, or null when it is singular. */
export function invert(A: Float64Array, n: number): Float64Array | null {
  const inv = new Float64Array(n * n);
  for (let c = 0; c < n; c++) {
    const e = new Float64Array(n);
    e[c] = 1;
    const col = solve(A, e, n);
    if (!col) return null;
    for (let r = 0; r < n; r++) inv[r * n + c] = col[r]!;
  }
  return inv;
}
