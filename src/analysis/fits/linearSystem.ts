/**
 * Small dense linear systems for least-squares normal equations: Gaussian elimination with partial
 * pivoting (Golub & Van Loan, Matrix Computations, §3.4). Sizes here are 2 to 4.
 */

/** Solves m·x = r; null when m is singular (degenerate data, e.g. a flat record). */
export function solveLinear(m: readonly (readonly number[])[], r: readonly number[]): number[] | null {
  const n = r.length;
  const a = m.map((row, i) => [...row, r[i]]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let i = c + 1; i < n; i++) if (Math.abs(a[i][c]) > Math.abs(a[p][c])) p = i;
    if (!(Math.abs(a[p][c]) > 0)) return null;
    [a[c], a[p]] = [a[p], a[c]];
    for (let i = c + 1; i < n; i++) {
      const f = a[i][c] / a[c][c];
      for (let j = c; j <= n; j++) a[i][j] -= f * a[c][j];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let i = n - 1; i >= 0; i--) {
    let s = a[i][n];
    for (let j = i + 1; j < n; j++) s -= a[i][j] * x[j];
    x[i] = s / a[i][i];
  }
  return x;
}

/** Diagonal of m⁻¹ (variances up to σ² for a least-squares covariance); null when m is singular. */
export function inverseDiagonal(m: readonly (readonly number[])[]): number[] | null {
  const out: number[] = [];
  for (let i = 0; i < m.length; i++) {
    const col = solveLinear(m, m.map((_, j) => (i === j ? 1 : 0)));
    if (!col) return null;
    out.push(col[i]);
  }
  return out;
}
