/**
 * The one linear solver of the analysis stage, for least-squares normal equations AᵀA·x = Aᵀb: a
 * Cholesky factorisation of a symmetric positive-definite matrix stored by its envelope (profile, or
 * "skyline"): row i holds A[i][first[i]…i]. The factor keeps the envelope (Golub & Van Loan, Matrix
 * Computations, 4th ed., §4.3.5 on band and envelope Cholesky, from memory), so the work is
 * Σᵢ (i − first[i])², linear in the number of unknowns when each row couples only a few neighbours, as
 * the harmonics of a long series do; a dense matrix is the envelope with every row full
 * (linearSystem.ts).
 *
 * Why our own and not a dense package (ml-matrix and the like): the harmonic fit solves systems of up
 * to thousands of unknowns whose rows couple a handful of neighbours; a dense O(n³) factorisation
 * would cost seconds where the envelope costs milliseconds.
 *
 * Conditioning: Cholesky needs no pivoting and is backward stable for any positive-definite matrix
 * (Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., ch. 10, from memory); the
 * solution's relative error is then about κ(AᵀA)·ε = κ(A)²·ε, the known price of normal equations,
 * which our systems afford: their columns (a sine, a cosine and a constant over whole cycles; window
 * transforms at separate harmonics) are close to orthogonal. A pivot that is not positive means the
 * matrix is singular to working precision (a flat record, coinciding unknowns): the solver returns
 * null and the caller withholds the result, rather than return a meaningless solution.
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

/** The Cholesky factor L (A = L·Lᵀ) in A's envelope, or null when A is not numerically positive definite. */
export function envelopeCholeskyFactor(a: Envelope): Float64Array | null {
  const { first } = a;
  const n = first.length;
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
  return l;
}

/** Solves L·Lᵀ·x = rhs with a factor from envelopeCholeskyFactor (same envelope as `a`); rhs is kept. */
export function envelopeCholeskySubstitute(a: Envelope, l: Float64Array, rhs: Float64Array): Float64Array {
  const { first } = a;
  const n = first.length;
  if (rhs.length !== n) throw new RangeError(`envelopeCholeskySolve: ${rhs.length} right-hand values for ${n} unknowns`);
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

/** Solves A·x = rhs; null when A is not numerically positive definite. */
export function envelopeCholeskySolve(a: Envelope, rhs: Float64Array): Float64Array | null {
  if (rhs.length !== a.first.length) throw new RangeError(`envelopeCholeskySolve: ${rhs.length} right-hand values for ${a.first.length} unknowns`);
  const l = envelopeCholeskyFactor(a);
  return l === null ? null : envelopeCholeskySubstitute(a, l, rhs);
}
