/**
 * envelopeCholeskySolve against an independent dense solve (Gaussian elimination with partial
 * pivoting, written here; Golub & Van Loan §3.4) on seeded random symmetric positive-definite
 * systems whose rows couple only a few neighbours, as the harmonic fit's normal equations do.
 */
import { describe, expect, it } from 'vitest';
import { at, envelopeCholeskySolve, envelopeOf } from '../../src/analysis/fits/envelopeCholesky.js';
import { inverseDiagonal, solveLinear } from '../../src/analysis/fits/linearSystem.js';
import { createRandom } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { expectAllWithin } from '../helpers/expectAllWithin.js';

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
      expect(x).not.toBeNull();
      expectAllWithin(x ?? [], ref, { abs: 1e-12 }, 'Gaussian elimination with partial pivoting (Golub & Van Loan §3.4)');
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

describe('solveLinear and inverseDiagonal (dense, through the same Cholesky)', () => {
  // The 3×3 matrix [[4, 2, 2], [2, 5, 3], [2, 3, 6]] with x = (1, −2, 3) gives b = (6, 1, 14);
  // its inverse is adj/det with det = 64 (cofactors worked by hand: 21, 20, 16 on the diagonal).
  const m = [
    [4, 2, 2],
    [2, 5, 3],
    [2, 3, 6],
  ];

  it('solveLinear recovers the solution of a small symmetric positive-definite system', () => {
    const x = solveLinear(m, [6, 1, 14]);
    expect(x).not.toBeNull();
    [1, -2, 3].forEach((want, i) => expectWithin(x?.[i], want, { abs: 1e-13 }, 'x chosen, b = m·x by hand'));
  });

  it('inverseDiagonal gives the diagonal of the inverse, cofactor over determinant', () => {
    const d = inverseDiagonal(m);
    [21 / 64, 20 / 64, 16 / 64].forEach((want, i) => expectWithin(d?.[i], want, { rel: 1e-13 }, 'cofactor / determinant, by hand'));
  });

  it('solveLinear returns null for a singular matrix, as a flat record gives', () => {
    expect(solveLinear([[1, 1], [1, 1]], [1, 1])).toBeNull();
    expect(inverseDiagonal([[0, 0], [0, 0]])).toBeNull();
  });

  it('solveLinear refuses a matrix that is not symmetric, a caller bug', () => {
    expect(() => solveLinear([[1, 2], [0, 1]], [1, 1])).toThrow(RangeError);
  });
});
