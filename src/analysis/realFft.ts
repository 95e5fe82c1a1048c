/**
 * The FFT kernel behind src/analysis/spectrum.ts (the only file that imports it): the DFT of a real
 * record of power-of-two length M, computed in place as a complex FFT of M/2 points followed by the
 * split step that separates the even and odd samples.
 *
 * Sources: radix-2 decimation in time with an in-place bit-reversed reordering (Cooley & Tukey,
 * Math. Comp. 19, 1965; Oppenheim & Schafer, Discrete-Time Signal Processing, 3rd ed., §9.3); the
 * real-input split X[k] = E[k] − i·W^k·O[k] with E, O from Z[k] and conj(Z[M/2 − k]) (Press et al.,
 * Numerical Recipes, 3rd ed., §12.3.2; Sorensen et al., IEEE Trans. ASSP 35(6), 1987).
 *
 * Why our own kernel and not fft.js: fft.js builds a table of M complex twiddles in a plain array
 * for every size (0.2 s at 2^20 and 0.7 s at 2^22 on the bench machine, more than the transforms
 * it serves) and wants an output buffer of 2·M doubles. Here the only table is one quarter wave of
 * cosines, cos(2πk/M) for k = 0…M/4 (sin(2πk/M) = cos(2π(M/4 − k)/M)), and the transform needs no
 * memory beyond its M + 2 doubles: fresh memory is slow to touch (shared/peer/MEASURED.md).
 */

/** Quarter-wave cosine tables, one per transform length; a few MB at most for the sizes used. */
const tables = new Map<number, Float64Array>();

function quarterCosines(size: number): Float64Array {
  let c = tables.get(size);
  if (c === undefined) {
    const quarter = size / 4;
    c = new Float64Array(Math.max(2, quarter + 1));
    const step = (2 * Math.PI) / size;
    for (let k = 0; k <= quarter; k++) c[k] = Math.cos(step * k);
    // Exact values at the ends of the quarter wave: Math.cos(π/2) is 6e-17, not 0.
    if (quarter >= 1) c[quarter] = 0;
    tables.set(size, c);
  }
  return c;
}

/**
 * In place: `buf[0…size−1]` holds the real record on entry; on return `buf[2k]`, `buf[2k+1]` hold
 * Re and Im of X[k] = Σ x[i]·e^(−2πik·i/M) for k = 0…M/2 (so `buf` must hold M + 2 doubles).
 */
export function realFftInPlace(buf: Float64Array, size: number): void {
  const half = size / 2;
  const c = quarterCosines(size);
  if (half >= 2) {
    reorder(buf, half);
    butterflies(buf, half, c, size);
  }
  split(buf, half, c, size);
}

/** Bit-reversed permutation of `n` interleaved complex values (Gold–Rader counter). */
function reorder(a: Float64Array, n: number): void {
  let j = 0;
  for (let i = 0; i < n - 1; i++) {
    if (i < j) {
      const i2 = 2 * i;
      const j2 = 2 * j;
      const tr = a[i2];
      const ti = a[i2 + 1];
      a[i2] = a[j2];
      a[i2 + 1] = a[j2 + 1];
      a[j2] = tr;
      a[j2 + 1] = ti;
    }
    let bit = n >> 1;
    while (j & bit) {
      j ^= bit;
      bit >>= 1;
    }
    j |= bit;
  }
}

/**
 * The log2(n) stages over `n` complex values, two at a time (a radix-4 pass: stages h and 2h of
 * the radix-2 graph, which halves the passes over a record far larger than the cache), after one
 * plain radix-2 stage when log2(n) is odd. Twiddles: w1 = W_4h^j = W_M^k with k = j·M/(4h) < M/4,
 * read from the quarter table as (c[k], −c[M/4 − k]); the inner stage uses W_2h^j = w1², and the
 * second pair of the outer stage W_4h^(j+h) = −i·w1.
 */
function butterflies(a: Float64Array, n: number, c: Float64Array, size: number): void {
  const quarter = size / 4;
  let h = 1;
  if ((Math.log2(n) & 1) === 1) {
    for (let p = 0; p < 2 * n; p += 4) {
      const r = a[p + 2];
      const i = a[p + 3];
      a[p + 2] = a[p] - r;
      a[p + 3] = a[p + 1] - i;
      a[p] += r;
      a[p + 1] += i;
    }
    h = 2;
  }
  for (; h < n; h *= 4) {
    const stride = size / (4 * h);
    const span = 8 * h;
    const h2 = 2 * h;
    for (let base = 0; base < 2 * n; base += span) {
      for (let j = 0; j < h; j++) {
        const k = j * stride;
        const w1r = c[k];
        const w1i = -c[quarter - k];
        const w2r = w1r * w1r - w1i * w1i;
        const w2i = 2 * w1r * w1i;
        const p0 = base + 2 * j;
        const p1 = p0 + h2;
        const p2 = p1 + h2;
        const p3 = p2 + h2;
        // Inner stage: (p0, p1) and (p2, p3) with w2.
        let xr = a[p1];
        let xi = a[p1 + 1];
        let tr = w2r * xr - w2i * xi;
        let ti = w2r * xi + w2i * xr;
        const b0r = a[p0] + tr;
        const b0i = a[p0 + 1] + ti;
        const b1r = a[p0] - tr;
        const b1i = a[p0 + 1] - ti;
        xr = a[p3];
        xi = a[p3 + 1];
        tr = w2r * xr - w2i * xi;
        ti = w2r * xi + w2i * xr;
        const b2r = a[p2] + tr;
        const b2i = a[p2 + 1] + ti;
        const b3r = a[p2] - tr;
        const b3i = a[p2 + 1] - ti;
        // Outer stage: (p0, p2) with w1, (p1, p3) with −i·w1.
        tr = w1r * b2r - w1i * b2i;
        ti = w1r * b2i + w1i * b2r;
        a[p0] = b0r + tr;
        a[p0 + 1] = b0i + ti;
        a[p2] = b0r - tr;
        a[p2 + 1] = b0i - ti;
        const ur = w1r * b3i + w1i * b3r;
        const ui = -(w1r * b3r - w1i * b3i);
        a[p1] = b1r + ur;
        a[p1 + 1] = b1i + ui;
        a[p3] = b1r - ur;
        a[p3 + 1] = b1i - ui;
      }
    }
  }
}

/** From Z = FFT(x[2n] + i·x[2n+1]) to the real record's bins 0…M/2, in place. */
function split(a: Float64Array, half: number, c: Float64Array, size: number): void {
  const quarter = size / 4;
  const z0r = a[0];
  const z0i = a[1];
  a[0] = z0r + z0i;
  a[1] = 0;
  a[2 * half] = z0r - z0i;
  a[2 * half + 1] = 0;
  for (let k = 1; 2 * k <= half; k++) {
    const p = 2 * k;
    const q = 2 * (half - k);
    const ar = a[p];
    const ai = a[p + 1];
    const br = a[q];
    const bi = a[q + 1];
    // E = (Z[k] + conj Z[H−k])/2, O = (Z[k] − conj Z[H−k])/2, T = W^k·O with W^k = cos − i·sin.
    const er = 0.5 * (ar + br);
    const ei = 0.5 * (ai - bi);
    const or = 0.5 * (ar - br);
    const oi = 0.5 * (ai + bi);
    const cs = c[k];
    const sn = c[quarter - k];
    const tr = cs * or + sn * oi;
    const ti = cs * oi - sn * or;
    // X[k] = E − i·T and X[H−k] = conj(E) − i·conj(T).
    a[p] = er + ti;
    a[p + 1] = ei - tr;
    a[q] = er - ti;
    a[q + 1] = -ei - tr;
  }
}
