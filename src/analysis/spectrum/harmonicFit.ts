/**
 * Least-squares multi-harmonic fit at a known fundamental, done on the windowed spectrum.
 *
 * Model (IEEE Std 1057 sine fit, clause on the 3-parameter fit, extended to harmonics as in
 * IEEE Std 1241's multi-harmonic fit): x[i] = c₀ + Σ_n Re(c_n·e^(iω_n·i)), ω_n = 2π·n·f₀/f_s.
 * Windowed and transformed, each term becomes the window's transform centred on ±n·f₀
 * (Harris 1978, eq. 8): X[k] = c₀W(k) + Σ_n ½c_n·W(k − p_n) + ½c̄_n·W(k + p_n), p_n in bins.
 * W is known exactly (windows.ts), so solving for c over the main-lobe bins of every harmonic
 * gives amplitudes with no scalloping whether or not the record holds whole cycles, and fits
 * overlapping lobes (few cycles) jointly. Terms further apart than COUPLING_BINS window bins
 * are not coupled: the 4-term Blackman-Harris sidelobes there are about −134 dB (its edge step
 * w[0] = 6·10⁻⁵ sets a 6 dB/octave tail: 6·10⁻⁵/(π·256·a₀)).
 */
import { at, envelopeCholeskySolve, envelopeOf, type Envelope } from '../fits/envelopeCholesky.js';
import type { SpectralFrame } from './spectralFrame.js';
import { kernelInto, kernelTerms, type KernelTerms } from './windows.js';

const COUPLING_BINS = 256;
/**
 * Harmonics past the first STRONG ones couple only within NEAR_BINS window bins (twice the 4-term
 * lobe): a waveform with a jump has harmonics under A₁/n, so past n = 54 their sidelobes beyond that
 * reach (under −100 dB, Harris 1978 Fig. 66) stay below the 1e-7·A₁ floor of harmonicAnalysis.ts, and
 * a series of thousands of harmonics costs a few couplings per bin instead of hundreds.
 */
const STRONG = 54;
const NEAR_BINS = 8;
/**
 * Ridge on the normal equations' diagonal, relative to its largest entry: λ = 1e-14 ≈ 45·ε. Overlapping
 * lobes (few cycles, a harmonic near a lobe of DC) can leave the matrix positive definite in exact
 * arithmetic but with a smallest eigenvalue lost in rounding, where Cholesky would stop at a pivot
 * that rounds to zero or below. The ridge moves the solution by about λ·κ relative (κ the condition
 * number): under 1e-6 of each amplitude while κ < 1e8, which holds for every record the tests fit
 * (they pass unchanged without it), far below the fit's own noise. Common practice (Tikhonov
 * regularisation as a guard; the size is ours).
 */
const RIDGE = 1e-14;

export interface HarmonicFit {
  readonly fundamental: number;
  /** Harmonics fitted: 1…count. */
  readonly count: number;
  /** Peak amplitude of harmonic n at index n; index 0 holds the residual DC. */
  readonly amplitude: Float64Array;
  /** Phase of harmonic n (cosine at the span's first sample), radians. */
  readonly phase: Float64Array;
  /** Σ|X − model|² over the fitted bins, and how many bins were fitted. */
  readonly residualPower: number;
  readonly fittedBins: number;
  /** Solution vector [c₀, Re c₁, Im c₁, …] before any filter-response correction. */
  readonly coefficients: Float64Array;
}

interface Coupling {
  /** Harmonic spacing in DFT bins. */
  readonly spacing: number;
  readonly count: number;
  /** Coupling reach in DFT bins of the strong harmonics (DC, 1…STRONG) and of the rest. */
  readonly far: number;
  readonly near: number;
  readonly unknowns: number;
}

interface Layout {
  readonly coupling: Coupling;
  /** The fitted bins: every main-lobe bin of DC and harmonics 1…count, in order. */
  readonly bins: Int32Array;
}

/** The coupling reaches and sizes of the fit, without its list of bins (lobeResidualShare needs no more). */
function coupling(frame: SpectralFrame, fundamental: number, count: number): Coupling {
  const spacing = fundamental / frame.binWidth;
  const perWindowBin = frame.spectrum.size / frame.length;
  const near = Math.max(NEAR_BINS * perWindowBin, frame.lobeBins + 1);
  return { spacing, count, far: COUPLING_BINS * perWindowBin, near, unknowns: 2 * count + 1 };
}

function layout(frame: SpectralFrame, fundamental: number, count: number): Layout {
  const reach = coupling(frame, fundamental, count);
  const last = frame.spectrum.bins - 1;
  const { spacing } = reach;
  // The lobes [g·spacing ∓ lobeBins] start in increasing order of g, so their union is listed by
  // walking them in order and skipping what the previous ones covered: no map of every bin.
  const lobe = (g: number, end: number): number => (end === 0 ? Math.max(0, Math.ceil(g * spacing - frame.lobeBins)) : Math.min(last, Math.floor(g * spacing + frame.lobeBins)));
  let n = 0;
  for (let g = 0, next = 0; g <= count; g++) {
    const lo = Math.max(next, lobe(g, 0));
    const hi = lobe(g, 1);
    if (hi >= lo) n += hi - lo + 1;
    next = Math.max(next, hi + 1);
  }
  const bins = new Int32Array(n);
  for (let g = 0, next = 0, i = 0; g <= count; g++) {
    const hi = lobe(g, 1);
    for (let k = Math.max(next, lobe(g, 0)); k <= hi; k++) bins[i++] = k;
    next = Math.max(next, hi + 1);
  }
  return { coupling: reach, bins };
}

/** Scratch for rowAt's two window kernels (re, im each); rowAt is not re-entered. */
const KERNEL = new Float64Array(4);
/** Scratch for harmonicRange's answer: [gLo, gHi] (gLo > gHi when no harmonic couples). */
const RANGE = new Int32Array(2);

/** Column of the first unknown of harmonic g (DC has one, the others two). */
const columnOf = (g: number): number => (g === 0 ? 0 : 2 * g - 1);

/**
 * Harmonics that may couple at bin k, into RANGE: the strong ones within `far`, the rest within
 * `near` (a superset; images included). Written into a scratch array, not returned as an object:
 * it runs for every fitted bin, and the first of these calls run before V8 has compiled them.
 */
function harmonicRange(lay: Coupling, k: number): void {
  const { spacing, count, far, near } = lay;
  const strongHi = Math.min(count, STRONG, Math.floor((k + far) / spacing));
  const strongLo = Math.max(0, Math.ceil((k - far) / spacing));
  const weakLo = Math.max(STRONG + 1, Math.ceil((k - near) / spacing));
  const weakHi = Math.min(count, Math.floor((k + near) / spacing));
  const hasStrong = strongLo <= strongHi;
  const hasWeak = weakLo <= weakHi;
  RANGE[0] = !hasStrong && !hasWeak ? 1 : hasStrong ? strongLo : weakLo;
  RANGE[1] = !hasStrong && !hasWeak ? 0 : hasWeak ? weakHi : strongHi;
}

/**
 * Complex coefficients at bin k of the unknowns from column columnOf(RANGE[0]) on (interleaved
 * re, im, two values per unknown), zero where a harmonic is too far to couple. Returns the number of
 * unknowns written (0 when none couples); RANGE holds the harmonics afterwards.
 */
function rowAt(frame: SpectralFrame, terms: KernelTerms, lay: Coupling, k: number, row: Float64Array): number {
  const { spacing } = lay;
  const size = frame.spectrum.size;
  const radiansPerBin = (2 * Math.PI) / size;
  harmonicRange(lay, k);
  const gLo = RANGE[0];
  const gHi = RANGE[1];
  if (gLo > gHi) return 0;
  const first = columnOf(gLo);
  const width = 2 * gHi + 1 - first;
  row.fill(0, 0, 2 * width);
  const kernel = KERNEL;
  for (let g = gLo; g <= gHi; g++) {
    const reach = g <= STRONG ? lay.far : lay.near;
    const p = g * spacing;
    const nearImage = Math.min(Math.abs(k + p), Math.abs(size - k - p));
    if (Math.abs(k - p) > reach && nearImage > reach) continue;
    // W(k − p) in kernel[0…1], W(k + p) in kernel[2…3] (zero when its image is too far to couple).
    kernelInto(terms, radiansPerBin * (k - p), kernel, 0);
    const u = columnOf(g) - first;
    if (g === 0) {
      row[2 * u] = kernel[0];
      row[2 * u + 1] = kernel[1];
      continue;
    }
    if (nearImage > reach) {
      kernel[2] = 0;
      kernel[3] = 0;
    } else kernelInto(terms, radiansPerBin * (k + p), kernel, 2);
    // ½c·W(k−p) + ½c̄·W(k+p) with c = a + ib: coefficient of a is (Wm + Wp)/2, of b is i(Wm − Wp)/2.
    row[2 * u] = (kernel[0] + kernel[2]) / 2;
    row[2 * u + 1] = (kernel[1] + kernel[3]) / 2;
    row[2 * u + 2] = -(kernel[1] - kernel[3]) / 2;
    row[2 * u + 3] = (kernel[0] - kernel[2]) / 2;
  }
  return width;
}

/**
 * First column each unknown couples with (over every fitted bin, the lowest unknown in its row),
 * and the most unknowns one row couples, which sizes the row buffer.
 */
function envelopeFor(lay: Layout): { envelope: Envelope; widest: number } {
  const first = new Int32Array(lay.coupling.unknowns);
  for (let i = 0; i < first.length; i++) first[i] = i;
  let widest = 1;
  for (const k of lay.bins) {
    harmonicRange(lay.coupling, k);
    const gLo = RANGE[0];
    const gHi = RANGE[1];
    if (gLo > gHi) continue;
    const lo = columnOf(gLo);
    widest = Math.max(widest, 2 * gHi + 1 - lo);
    for (let u = lo; u <= 2 * gHi; u++) if (first[u] > lo) first[u] = lo;
  }
  return { envelope: envelopeOf(first), widest };
}

/** Fits DC and harmonics 1…count of `fundamental` (Hz); null when the system is singular. */
export function fitHarmonics(frame: SpectralFrame, fundamental: number, count: number): HarmonicFit | null {
  if (!(fundamental > 0) || !Number.isInteger(count) || count < 1) {
    throw new RangeError(`fitHarmonics: need fundamental > 0 and an integer count ≥ 1, got ${fundamental}, ${count}`);
  }
  if (count * fundamental >= frame.sampleRate / 2) {
    throw new RangeError(`fitHarmonics: harmonic ${count} of ${fundamental} Hz is not below Nyquist (${frame.sampleRate / 2} Hz)`);
  }
  const lay = layout(frame, fundamental, count);
  const u = lay.coupling.unknowns;
  const { envelope: normal, widest } = envelopeFor(lay);
  const rhs = new Float64Array(u);
  const row = new Float64Array(2 * widest);
  const s = frame.spectrum;
  let total = 0;
  const terms = kernelTerms(frame.window, frame.length);
  for (const k of lay.bins) {
    const width = rowAt(frame, terms, lay.coupling, k, row);
    accumulate(normal, rhs, row, columnOf(RANGE[0]), width, s.re(k), s.im(k));
    total += s.power(k);
  }
  let maxDiag = 0;
  for (let i = 0; i < u; i++) maxDiag = Math.max(maxDiag, normal.values[at(normal, i, i)]);
  for (let i = 0; i < u; i++) normal.values[at(normal, i, i)] += RIDGE * maxDiag;
  // The solver keeps `rhs` (it writes its solution into a new array).
  const x = envelopeCholeskySolve(normal, rhs);
  if (x === null) return null;
  // At the least-squares solution ‖X − Ax‖² = ‖X‖² − xᵀAᵀX (normal equations), so no second pass.
  let explained = 0;
  for (let i = 0; i < u; i++) explained += x[i] * rhs[i];
  return summarise(frame, x, fundamental, count, Math.max(0, total - explained), lay.bins.length);
}

function accumulate(normal: Envelope, rhs: Float64Array, row: Float64Array, first: number, width: number, xr: number, xi: number): void {
  for (let a = 0; a < width; a++) {
    const ar = row[2 * a];
    const ai = row[2 * a + 1];
    if (ar === 0 && ai === 0) continue;
    rhs[first + a] += ar * xr + ai * xi;
    // Lower triangle only: A[first + a][first + b] for b ≤ a, inside the row's envelope by construction.
    const base = at(normal, first + a, first);
    for (let b = 0; b <= a; b++) normal.values[base + b] += ar * row[2 * b] + ai * row[2 * b + 1];
  }
}

function summarise(
  frame: SpectralFrame,
  x: Float64Array,
  fundamental: number,
  count: number,
  residualPower: number,
  fittedBins: number,
): HarmonicFit {
  const amplitude = new Float64Array(count + 1);
  const phase = new Float64Array(count + 1);
  amplitude[0] = x[0];
  for (let n = 1; n <= count; n++) {
    const a = x[2 * n - 1];
    const b = x[2 * n];
    amplitude[n] = Math.hypot(a, b) / frame.response(n * fundamental);
    phase[n] = Math.atan2(b, a);
  }
  return { fundamental, count, amplitude, phase, residualPower, fittedBins, coefficients: x };
}

/**
 * Share of the power in harmonic n's main-lobe bins that the fitted model leaves unexplained.
 * A steady tone at the given frequency leaves only noise; a wrong or drifting fundamental
 * leaves a large share.
 */
export function lobeResidualShare(frame: SpectralFrame, fit: HarmonicFit, n: number): number {
  const lay = coupling(frame, fit.fundamental, fit.count);
  const s = frame.spectrum;
  const p = n * lay.spacing;
  let residual = 0;
  let total = 0;
  const lo = Math.max(0, Math.ceil(p - frame.lobeBins));
  const hi = Math.min(s.bins - 1, Math.floor(p + frame.lobeBins));
  // The row holds the unknowns that couple within this lobe only, not all of them.
  let widest = 1;
  for (let k = lo; k <= hi; k++) {
    harmonicRange(lay, k);
    if (RANGE[0] <= RANGE[1]) widest = Math.max(widest, 2 * RANGE[1] + 1 - columnOf(RANGE[0]));
  }
  const row = new Float64Array(2 * widest);
  const terms = kernelTerms(frame.window, frame.length);
  for (let k = lo; k <= hi; k++) {
    const width = rowAt(frame, terms, lay, k, row);
    const first = columnOf(RANGE[0]);
    let mr = 0;
    let mi = 0;
    for (let a = 0; a < width; a++) {
      mr += row[2 * a] * fit.coefficients[first + a];
      mi += row[2 * a + 1] * fit.coefficients[first + a];
    }
    residual += (s.re(k) - mr) ** 2 + (s.im(k) - mi) ** 2;
    total += s.power(k);
  }
  return total > 0 ? residual / total : 0;
}
