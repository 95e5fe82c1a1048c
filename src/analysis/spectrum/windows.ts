/**
 * Cosine-sum DFT windows and their exact transforms.
 *
 * Sources: F. J. Harris, "On the use of windows for harmonic analysis with the discrete Fourier
 * transform", Proc. IEEE 66(1), 1978 — the periodic ("DFT-even") form, rectangular, Hann and the
 * minimum 4-term Blackman-Harris window (a = 0.35875, 0.48829, 0.14128, 0.01168, Table I and
 * eq. 33); flat-top coefficients as defined by scipy.signal.windows.flattop (D'Antona & Ferrero
 * 2006; also listed by Heinzel, Rüdiger & Schilling 2002). All take the form
 * w[i] = Σ_j (−1)^j·a_j·cos(2πji/L), i = 0…L−1.
 *
 * The transform W(θ) = Σ w[i]·e^(−iθi) is a sum of shifted Dirichlet kernels, so the response
 * to a tone at any fractional bin is known exactly: the harmonic fit relies on that.
 */
export type WindowKind = 'rectangular' | 'hann' | 'blackman-harris-4' | 'flat-top';

export const WINDOW_KINDS: readonly WindowKind[] = ['rectangular', 'hann', 'blackman-harris-4', 'flat-top'];

const COEFFICIENTS: Readonly<Record<WindowKind, readonly number[]>> = {
  rectangular: [1],
  hann: [0.5, 0.5],
  'blackman-harris-4': [0.35875, 0.48829, 0.14128, 0.01168],
  'flat-top': [0.21557895, 0.41663158, 0.277263158, 0.083578947, 0.006947368],
};

export const WINDOW_LABELS: Readonly<Record<WindowKind, string>> = {
  rectangular: 'rectangular',
  hann: 'Hann',
  'blackman-harris-4': '4-term Blackman-Harris (Harris 1978)',
  'flat-top': 'flat-top (scipy flattop coefficients)',
};

/** Half-width of the main lobe in bins of the window length: the first null sits at as many bins as the window has terms. */
export function mainLobeHalfWidth(kind: WindowKind): number {
  return COEFFICIENTS[kind].length;
}

export function windowCoefficients(kind: WindowKind): readonly number[] {
  return COEFFICIENTS[kind];
}

/** Most cosine terms of a window (the flat-top's five). */
const MAX_TERMS = 5;

/** Samples per block of the cosine recurrence in windowSamples; each block restarts from Math.cos/sin. */
const RECURRENCE_BLOCK = 32;

/**
 * The periodic window of the given length, written into `out` when given.
 * Cost matters here (one window per analysed span, up to 2^20 samples), so the window's symmetry
 * w[i] = w[L − i] halves the work, and cos(x·i) advances by a rotation (cos, sin)·(cos x, sin x)
 * that restarts from Math.cos/Math.sin every 32 samples, so rounding grows to a few 1e-15 at most.
 */
export function windowSamples(kind: WindowKind, length: number, out?: Float64Array): Float64Array {
  if (!Number.isInteger(length) || length < 1) throw new RangeError(`windowSamples: length must be a positive integer, got ${length}`);
  if (out !== undefined && out.length < length) throw new RangeError(`windowSamples: out holds ${out.length} < ${length}`);
  const w = out ?? new Float64Array(length);
  windowPass(kind, length, null, 0, w);
  return w;
}

/** Σw, Σw² and Σ(x − mean)² of a windowed span (applyWindow). */
export interface WindowSums {
  readonly s1: number;
  readonly s2: number;
  readonly squares: number;
}

/**
 * (span[i] − mean)·w[i] into out[0…L), L = span.length, with the same window values as
 * windowSamples, computed in the same pass as the product: one pass over a long span instead of
 * two (a long span's window costs about as much to write as to apply). `out` may not be `span`.
 */
export function applyWindow(kind: WindowKind, span: Float64Array, mean: number, out: Float64Array): WindowSums {
  const length = span.length;
  if (length < 1) throw new RangeError('applyWindow: the span is empty');
  if (out.length < length) throw new RangeError(`applyWindow: out holds ${out.length} < ${length}`);
  return windowPass(kind, length, span, mean, out);
}

/** The one window loop: out[i] = w[i], or (span[i] − mean)·w[i] when a span is given. */
function windowPass(kind: WindowKind, length: number, span: Float64Array | null, mean: number, out: Float64Array): WindowSums {
  const a = COEFFICIENTS[kind];
  if (a.length > MAX_TERMS) throw new RangeError(`windowPass: ${kind} has ${a.length} terms, at most ${MAX_TERMS} are written out`);
  // The terms written out, the missing ones zero: v + 0·cos(jx) is v exactly, so every window of up
  // to five terms gets the values of the loop over its own terms, in fewer steps while the pass
  // still runs unoptimised (its first call on a 2^20 span took 46–105 ms, the fifth 6.5 ms).
  const signed = new Float64Array(MAX_TERMS);
  for (let j = 0; j < a.length; j++) signed[j] = j % 2 === 1 ? -a[j] : a[j];
  const [t0, t1, t2, t3, t4] = signed;
  const step = (2 * Math.PI) / length;
  const cd = Math.cos(step);
  const sd = Math.sin(step);
  const half = Math.floor(length / 2);
  let s1 = 0;
  let s2 = 0;
  let squares = 0;
  for (let block = 0; block <= half; block += RECURRENCE_BLOCK) {
    let c1 = Math.cos(step * block);
    let s = Math.sin(step * block);
    const stop = Math.min(block + RECURRENCE_BLOCK, half + 1);
    for (let i = block; i < stop; i++) {
      // cos(jx) by the Chebyshev recurrence cos(jx) = 2cos(x)·cos((j−1)x) − cos((j−2)x).
      const c2 = 2 * c1 * c1 - 1;
      const c3 = 2 * c1 * c2 - c1;
      const c4 = 2 * c1 * c3 - c2;
      let v = t0;
      v += t1 * c1;
      v += t2 * c2;
      v += t3 * c3;
      v += t4 * c4;
      const d = span === null ? 1 : span[i] - mean;
      out[i] = span === null ? v : d * v;
      s1 += v;
      s2 += v * v;
      squares += d * d;
      const m = length - i;
      if (i > 0 && m !== i) {
        const e = span === null ? 1 : span[m] - mean;
        out[m] = span === null ? v : e * v;
        s1 += v;
        s2 += v * v;
        squares += e * e;
      }
      const c = c1 * cd - s * sd;
      s = s * cd + c1 * sd;
      c1 = c;
    }
  }
  return { s1, s2, squares };
}

export interface Complex {
  readonly re: number;
  readonly im: number;
}

/** Dirichlet kernel Σ_{i<L} e^(−iφi) = e^(−iφ(L−1)/2)·sin(Lφ/2)/sin(φ/2), 2π-periodic in φ. */
function dirichlet(length: number, phi: number): Complex {
  const twoPi = 2 * Math.PI;
  let p = phi - twoPi * Math.round(phi / twoPi);
  if (p <= -Math.PI) p += twoPi;
  const s = Math.sin(p / 2);
  const mag = Math.abs(s) < 1e-12 ? length : Math.sin((length * p) / 2) / s;
  const arg = (-p * (length - 1)) / 2;
  return { re: mag * Math.cos(arg), im: mag * Math.sin(arg) };
}

/**
 * W(θ) = Σ_{i<L} w[i]·e^(−iθi) for the periodic window of length L (θ in radians per sample).
 * Each shifted kernel D(φ ∓ 2πj/L) shares sin(Lφ/2) (up to the sign (−1)^j) and the phase
 * e^(−iφ(L−1)/2) (up to e^(±iπj(L−1)/L)), so one evaluation costs a few sines, not 4 per term.
 */
export function windowKernel(kind: WindowKind, length: number, theta: number): Complex {
  const out = new Float64Array(2);
  kernelInto(kernelTerms(kind, length), theta, out, 0);
  return { re: out[0], im: out[1] };
}

/**
 * windowKernel written into out[at] (re) and out[at + 1] (im), with the terms of its window and
 * length looked up once (kernelTerms), for loops that evaluate it for every fitted bin: no object
 * per call. sin((φ ∓ jΔ)/2) comes from sin(φ/2) and cos(φ/2) by the angle sum with cos(jΔ/2) and
 * sin(jΔ/2), two sines for all the terms; near a zero of one of them (|φ ∓ jΔ| ≲ 2e-9) its absolute
 * error, a few 1e-17 for the small φ of a fitted bin, is what the direct difference φ − jΔ carries too.
 */
export function kernelInto(t: KernelTerms, theta: number, out: Float64Array, at: number): void {
  const a = t.a;
  const length = t.length;
  const twoPi = 2 * Math.PI;
  let phi = theta - twoPi * Math.round(theta / twoPi);
  if (phi <= -Math.PI) phi += twoPi;
  const sh = Math.sin(phi / 2);
  const ch = Math.cos(phi / 2);
  let sumRe = 0;
  let sumIm = 0;
  for (let j = 0; j < a.length; j++) {
    const sm = sh * t.halfCos[j] - ch * t.halfSin[j];
    const sp = sh * t.halfCos[j] + ch * t.halfSin[j];
    if (Math.abs(sm) < 1e-9 || Math.abs(sp) < 1e-9) {
      kernelByTerms(COEFFICIENTS[t.kind], length, phi, out, at);
      return;
    }
    if (j === 0) {
      sumRe += a[0] / sm;
      continue;
    }
    const c = t.cos[j];
    const s = t.sin[j];
    // (a_j/2)·(e^(iψ)/sm + e^(−iψ)/sp); the window's (−1)^j cancels the one from sin(Lφ/2 ∓ πj).
    sumRe += (a[j] / 2) * (c / sm + c / sp);
    sumIm += (a[j] / 2) * (s / sm - s / sp);
  }
  const lead = Math.sin((length * phi) / 2);
  const arg = (-phi * (length - 1)) / 2;
  const pr = lead * Math.cos(arg);
  const pi = lead * Math.sin(arg);
  out[at] = pr * sumRe - pi * sumIm;
  out[at + 1] = pr * sumIm + pi * sumRe;
}

/** The terms of windowKernel that depend on the window and its length only (kernelTerms). */
export interface KernelTerms {
  readonly kind: WindowKind;
  readonly length: number;
  /** The window's coefficients a_j. */
  readonly a: Float64Array;
  /** cos ψ_j and sin ψ_j, ψ_j = πj(L − 1)/L. */
  readonly cos: Float64Array;
  readonly sin: Float64Array;
  /** cos(jΔ/2) and sin(jΔ/2), Δ = 2π/L. */
  readonly halfCos: Float64Array;
  readonly halfSin: Float64Array;
}

/**
 * windowKernel is called for every fitted bin of every harmonic, so what depends on the length
 * only is computed once. The last length's values are kept, one entry, so a new length replaces them.
 */
let termsCache: KernelTerms | null = null;

export function kernelTerms(kind: WindowKind, length: number): KernelTerms {
  if (termsCache !== null && termsCache.kind === kind && termsCache.length === length) return termsCache;
  const a = Float64Array.from(COEFFICIENTS[kind]);
  const terms = a.length;
  const cos = new Float64Array(terms);
  const sin = new Float64Array(terms);
  const halfCos = new Float64Array(terms);
  const halfSin = new Float64Array(terms);
  for (let j = 0; j < terms; j++) {
    const psi = (Math.PI * j * (length - 1)) / length;
    cos[j] = Math.cos(psi);
    sin[j] = Math.sin(psi);
    halfCos[j] = Math.cos((Math.PI * j) / length);
    halfSin[j] = Math.sin((Math.PI * j) / length);
  }
  termsCache = { kind, length, a, cos, sin, halfCos, halfSin };
  return termsCache;
}

/** Term-by-term sum of Dirichlet kernels, used where a shifted kernel sits on its peak. */
function kernelByTerms(a: readonly number[], length: number, theta: number, out: Float64Array, at: number): void {
  let re = 0;
  let im = 0;
  for (let j = 0; j < a.length; j++) {
    const c = j === 0 ? a[0] : ((j % 2 === 1 ? -a[j] : a[j]) / 2);
    const shifts = j === 0 ? [0] : [(2 * Math.PI * j) / length, (-2 * Math.PI * j) / length];
    for (const sh of shifts) {
      const d = dirichlet(length, theta - sh);
      re += c * d.re;
      im += c * d.im;
    }
  }
  out[at] = re;
  out[at + 1] = im;
}
