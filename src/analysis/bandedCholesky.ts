/**
 * Solves A·x = b for a symmetric positive-definite band matrix by Cholesky factorisation restricted to
 * the band (Golub & Van Loan, Matrix Computations, 4th ed., §4.3.5, Algorithm 4.3.5 "band Cholesky"):
 * O(n·p²) work and O(n·p) memory for n unknowns and half-bandwidth p, so a fit of hundreds of
 * harmonics stays linear in their number. Storage: `band[i·(p + 1) + d]` holds A[i][i − d], d = 0…p.
 * Returns null when A is not numerically positive definite (the caller withholds the fit).
 */
export function bandedCholeskySolve(band: Float64Array, rhs: Float64Array, n: number, p: number): Float64Array | null {
  const w = p + 1;
  if (band.length !== n * w || rhs.length !== n) throw new RangeError(`bandedCholeskySolve: sizes ${band.length}, ${rhs.length} do not fit n = ${n}, p = ${p}`);
  const l = new Float64Array(n * w);
  for (let j = 0; j < n; j++) {
    const first = Math.max(0, j - p);
    let d = band[j * w];
    for (let k = first; k < j; k++) d -= l[j * w + (j - k)] ** 2;
    if (!(d > 0)) return null;
    const ljj = Math.sqrt(d);
    l[j * w] = ljj;
    const last = Math.min(n - 1, j + p);
    for (let i = j + 1; i <= last; i++) {
      let s = band[i * w + (i - j)];
      for (let k = Math.max(0, i - p); k < j; k++) s -= l[i * w + (i - k)] * l[j * w + (j - k)];
      l[i * w + (i - j)] = s / ljj;
    }
  }
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = rhs[i];
    for (let k = Math.max(0, i - p); k < i; k++) s -= l[i * w + (i - k)] * y[k];
    y[i] = s / l[i * w];
  }
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i];
    for (let k = i + 1; k <= Math.min(n - 1, i + p); k++) s -= l[k * w + (k - i)] * x[k];
    x[i] = s / l[i * w];
  }
  return x;
}
