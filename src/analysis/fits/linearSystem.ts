/**
 * Small dense normal equations (the 3- and 4-parameter sine fits: sizes 2 to 4), solved by the
 * analysis stage's one solver, the Cholesky factorisation of envelopeCholesky.ts with every row full.
 * The matrices are symmetric by construction (AᵀA); an asymmetric one is a caller bug.
 */
import { at, envelopeCholeskyFactor, envelopeCholeskySubstitute, envelopeOf, type Envelope } from './envelopeCholesky.js';

function denseEnvelope(m: readonly (readonly number[])[]): Envelope {
  const n = m.length;
  const e = envelopeOf(new Int32Array(n));
  for (let i = 0; i < n; i++) {
    if (m[i].length !== n) throw new RangeError(`linearSystem: row ${i} has ${m[i].length} values for ${n} unknowns`);
    for (let j = 0; j <= i; j++) {
      // Tolerance for the rounding of sums accumulated in another order on each side.
      if (!(Math.abs(m[i][j] - m[j][i]) <= 1e-12 * (Math.abs(m[i][j]) + Math.abs(m[j][i])))) {
        throw new RangeError(`linearSystem: the matrix is not symmetric at (${i}, ${j}): ${m[i][j]} vs ${m[j][i]}`);
      }
      e.values[at(e, i, j)] = m[i][j];
    }
  }
  return e;
}

/** Solves m·x = r for a symmetric m; null when m is singular to working precision (e.g. a flat record). */
export function solveLinear(m: readonly (readonly number[])[], r: readonly number[]): number[] | null {
  const e = denseEnvelope(m);
  const l = envelopeCholeskyFactor(e);
  return l === null ? null : Array.from(envelopeCholeskySubstitute(e, l, Float64Array.from(r)));
}

/** Diagonal of m⁻¹ (variances up to σ² for a least-squares covariance); null when m is singular. */
export function inverseDiagonal(m: readonly (readonly number[])[]): number[] | null {
  const e = denseEnvelope(m);
  const l = envelopeCholeskyFactor(e);
  if (l === null) return null;
  return m.map((_, i) => envelopeCholeskySubstitute(e, l, Float64Array.from(m, (_, j) => (i === j ? 1 : 0)))[i]);
}
