/**
 * envelopeCholeskySolve against an independent dense solve (Gaussian elimination with partial
 * pivoting, written here; Golub & Van Loan §3.4) on seeded random symmetric positive-definite
 * systems whose rows couple only a few neighbours, as the harmonic fit's normal equations do.
 */
import { describe, expect, it } from 'vitest';
import { at, envelopeCholeskySolve, envelopeOf } from '../../src/analysis/fits/envelopeCholesky.js';
import { createRandom } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';

function denseSolve(a: number[][], b: number[]): number[] {
  const n = b.length;
  const m = a.map((row, i) => [...row, b[i]]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    [m[c], m[p]] = [m[p], m[c]];
    for (let r = c + 1; r < n; r++) {
      const f = m[r][c] / m[c][c];
      for (let k = c; k <= n; k++) m[r][k] -= f * m[c][k];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = m[r][n];
    for (let k = r + 1; k < n; k++) s -= m[r][k] * x[k];
    x[r] = s / m[r][r];
  }
  return x;
}

describe('envelopeCholeskySolve', () => {
  it('envelopeCholeskySolve matches a dense solve on random banded SPD systems with a wide first block', () => {
    const rnd = createRandom(15);
    for (let trial = 0; trial < 5; trial++) {
      const n = 40;
      // Rows couple 3 neighbours, and the first 8 unknowns couple with every row up to 20 (like DC and the strong harmonics).
      const first = Int32Array.from({ length: n }, (_, i) => (i < 20 ? 0 : Math.max(0, i - 3)));
      const dense = Array.from({ length: n }, () => new Array<number>(n).fill(0));
      const e = envelopeOf(first);
      for (let i = 0; i < n; i++) {
        for (let j = first[i]; j < i; j++) {
          const v = rnd.uniform() - 0.5;
          dense[i][j] = dense[j][i] = v;
          e.values[at(e, i, j)] = v;
        }
        dense[i][i] = n;
        e.values[at(e, i, i)] = n;
      }
      const b = Array.from({ length: n }, () => rnd.uniform() - 0.5);
      const x = envelopeCholeskySolve(e, Float64Array.from(b));
      const ref = denseSolve(dense, b);
      for (let i = 0; i < n; i++) expectWithin(x?.[i], ref[i], { abs: 1e-12 }, 'Gaussian elimination with partial pivoting (Golub & Van Loan §3.4)');
    }
  });

  it('envelopeCholeskySolve returns null for a matrix that is not positive definite', () => {
    const e = envelopeOf(Int32Array.from([0, 0]));
    e.values.set([1, 2, 1]); // [[1, 2], [2, 1]] has eigenvalues 3 and −1
    expect(envelopeCholeskySolve(e, Float64Array.from([1, 1]))).toBeNull();
  });

  it('envelopeOf refuses a row that starts after its own diagonal', () => {
    expect(() => envelopeOf(Int32Array.from([0, 2]))).toThrow(RangeError);
  });
});
