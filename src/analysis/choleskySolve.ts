/**
 * Solves A·x = b for a symmetric positive-definite A by Cholesky factorisation A = L·Lᵀ
 * (Golub & Van Loan, Matrix Computations, 4th ed., Algorithm 4.2.1). A is n×n, row-major.
 * Returns null when A is not numerically positive definite (the caller withholds the fit).
 */
export function choleskySolve(a: Float64Array, b: Float64Array, n: number): Float64Array | null {
  if (a.length !== n * n || b.length !== n) throw new RangeError(`choleskySolve: sizes ${a.length}, ${b.length} do not fit n = ${n}`);
  const l = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j];
    for (let k = 0; k < j; k++) d -= l[j * n + k] * l[j * n + k];
    if (!(d > 0)) return null;
    const ljj = Math.sqrt(d);
    l[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= l[i * n + k] * l[j * n + k];
      l[i * n + j] = s / ljj;
    }
  }
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i * n + k] * y[k];
    y[i] = s / l[i * n + i];
  }
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i];
    for (let k = i + 1; k < n; k++) s -= l[k * n + i] * x[k];
    x[i] = s / l[i * n + i];
  }
  return x;
}
