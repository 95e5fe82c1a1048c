/**
 * Solves A·x = b for a symmetric positive-definite matrix stored by its envelope (profile, or
 * "skyline"): row i holds A[i][first[i]…i]. Cholesky factorisation keeps the envelope (Golub & Van
 * Loan, Matrix Computations, 4th ed., §4.3.5 on band and envelope Cholesky, from memory), so the work
 * is Σᵢ (i − first[i])², linear in the number of unknowns when each row couples only a few neighbours,
 * as the harmonics of a long series do. Returns null when A is not numerically positive definite.
 */
export interface Envelope {
  /** First stored column of each row. */
  readonly first: Int32Array;
  /** Offset of each row's first stored value in `values`; offsets[n] is the total. */
  readonly offsets: Int32Array;
  readonly values: Float64Array;
}

/** An all-zero envelope matrix with the given first columns. */
export function envelopeOf(first: Int32Array): Envelope {
  const n = first.length;
  const offsets = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) {
    if (!(first[i] >= 0 && first[i] <= i)) throw new RangeError(`envelopeOf: row ${i} starts at column ${first[i]}`);
    offsets[i + 1] = offsets[i] + i - first[i] + 1;
  }
  return { first, offsets, values: new Float64Array(offsets[n]) };
}

/** Index of A[i][j] (j ≤ i, j ≥ first[i]) in `values`. */
export const at = (e: Envelope, i: number, j: number): number => e.offsets[i] + j - e.first[i];

export function envelopeCholeskySolve(a: Envelope, rhs: Float64Array): Float64Array | null {
  const { first } = a;
  const n = first.length;
  if (rhs.length !== n) throw new RangeError(`envelopeCholeskySolve: ${rhs.length} right-hand values for ${n} unknowns`);
  const l = new Float64Array(a.values.length);
  for (let i = 0; i < n; i++) {
    for (let j = first[i]; j <= i; j++) {
      let s = a.values[at(a, i, j)];
      for (let k = Math.max(first[i], first[j]); k < j; k++) s -= l[at(a, i, k)] * l[at(a, j, k)];
      if (j < i) {
        l[at(a, i, j)] = s / l[at(a, j, j)];
      } else {
        if (!(s > 0)) return null;
        l[at(a, i, i)] = Math.sqrt(s);
      }
    }
  }
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = rhs[i];
    for (let k = first[i]; k < i; k++) s -= l[at(a, i, k)] * y[k];
    y[i] = s / l[at(a, i, i)];
  }
  // Back substitution by columns: x[i] is final once every later row has given its share.
  const x = y;
  for (let i = n - 1; i >= 0; i--) {
    x[i] /= l[at(a, i, i)];
    for (let k = first[i]; k < i; k++) x[k] -= l[at(a, i, k)] * x[i];
  }
  return x;
}
