/**
 * The FFT kernel behind src/analysis/spectrum/spectrum.ts (the only file that imports it): the DFT of a real
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
    fillCosines(c, quarter, (2 * Math.PI) / size);
    // Exact values at the ends of the quarter wave: Math.cos(π/2) is 6e-17, not 0.
    if (quarter >= 1) c[quarter] = 0;
    tables.set(size, c);
  }
  return c;
}

/**
 * c[k] = cos(step·k) for k = 0…last, with k split as hi·B + lo (B ≈ √last) and
 * cos(a + b) = cos a·cos b − sin a·sin b from two short tables of Math.cos/Math.sin values: some
 * 2√last trigonometric calls instead of `last`, each entry within a few ulp.
 */
function fillCosines(c: Float64Array, last: number, step: number): void {
  const block = 2 ** Math.ceil(Math.log2(Math.sqrt(Math.max(1, last))));
  const fineCos = new Float64Array(block);
  const fineSin = new Float64Array(block);
  for (let lo = 0; lo < block; lo++) {
    fineCos[lo] = Math.cos(step * lo);
    fineSin[lo] = Math.sin(step * lo);
  }
  for (let base = 0; base <= last; base += block) {
    const ca = Math.cos(step * base);
    const sa = Math.sin(step * base);
    const stop = Math.min(block, last - base + 1);
    for (let lo = 0; lo < stop; lo++) c[base + lo] = ca * fineCos[lo] - sa * fineSin[lo];
  }
}

/**
 * V8 runs new code in its interpreter and compiles it once it has seen it run; a long first
 * transform would spend its early stages there, and drop back when a branch it had not yet seen
 * comes up. A few small transforms first give the compiler what it needs: on the bench machine the
 * first 2^20-point transform of a process took a median 129 ms of CPU without this and 104 ms with
 * it (10 alternating runs each).
 */
const PRIME_ABOVE = 2 ** 16;
let primed = false;

function prime(): void {
  primed = true;
  const size = 2 ** 12;
  const scratch = new Float64Array(size + 2);
  for (let run = 0; run < 3; run++) {
    scratch.fill(1, 0, size);
    realFftInPlace(scratch, size);
  }
}

/**
 * In place: `buf[0…size−1]` holds the real record on entry; on return `buf[2k]`, `buf[2k+1]` hold
 * Re and Im of X[k] = Σ x[i]·e^(−2πik·i/M) for k = 0…M/2 (so `buf` must hold M + 2 doubles).
 */
export function realFftInPlace(buf: Float64Array, size: number): void {
  if (size >= PRIME_ABOVE && !primed) prime();
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

/** Complex points per block in which the early stages run to completion (64 KiB: stays in cache). */
const BLOCK = 2 ** 12;

/**
 * The log2(n) stages over `n` complex values, two at a time (a radix-4 pass: stages h and 2h of
 * the radix-2 graph), after one plain radix-2 stage when log2(n) is odd. The stages whose groups
 * fit in a block of BLOCK points run block by block, each block through all of them while it is
 * in cache; only the later stages pass over the whole record. Every value meets the same
 * butterflies in the same order as stage-by-stage, so the result is identical.
 */
function butterflies(a: Float64Array, n: number, c: Float64Array, size: number): void {
  const odd = (Math.log2(n) & 1) === 1;
  const block = Math.min(n, BLOCK);
  let first = odd ? 2 : 1;
  for (let from = 0; from < n; from += block) {
    if (odd) radix2Pass(a, from, from + block);
    for (let h = first; 4 * h <= block; h *= 4) radix4Pass(a, from, from + block, h, c, size);
  }
  while (4 * first <= block) first *= 4;
  for (let h = first; h < n; h *= 4) radix4Pass(a, 0, n, h, c, size);
}

/** Stage h = 1 over points from…to−1: butterflies of neighbours, twiddle 1. */
function radix2Pass(a: Float64Array, from: number, to: number): void {
  for (let p = 2 * from; p < 2 * to; p += 4) {
    const r = a[p + 2];
    const i = a[p + 3];
    a[p + 2] = a[p] - r;
    a[p + 3] = a[p + 1] - i;
    a[p] += r;
    a[p + 1] += i;
  }
}

/**
 * Stages h and 2h over points from…to−1 (a multiple of 4h apart). Twiddles: w1 = W_4h^j = W_M^k with
 * k = j·M/(4h) < M/4, read from the quarter table as (c[k], −c[M/4 − k]); the inner stage uses
 * W_2h^j = w1², and the second pair of the outer stage W_4h^(j+h) = −i·w1.
 */
function radix4Pass(a: Float64Array, from: number, to: number, h: number, c: Float64Array, size: number): void {
  const quarter = size / 4;
  const stride = size / (4 * h);
  const span = 8 * h;
  const h2 = 2 * h;
  for (let base = 2 * from; base < 2 * to; base += span) {
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
