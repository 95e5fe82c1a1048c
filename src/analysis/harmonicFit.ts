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
import { choleskySolve } from './choleskySolve.js';
import { frameKernel, type SpectralFrame } from './spectralFrame.js';

const COUPLING_BINS = 256;

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

interface Layout {
  readonly positions: Float64Array;
  readonly column: Int32Array;
  readonly unknowns: number;
  readonly bins: readonly number[];
}

function layout(frame: SpectralFrame, fundamental: number, count: number): Layout {
  const last = frame.spectrum.bins - 1;
  const positions = new Float64Array(count + 1);
  const column = new Int32Array(count + 1);
  const fitted = new Uint8Array(last + 1);
  for (let g = 0; g <= count; g++) {
    positions[g] = (g * fundamental) / frame.binWidth;
    column[g] = g === 0 ? 0 : 2 * g - 1;
    const lo = Math.max(0, Math.ceil(positions[g] - frame.lobeBins));
    const hi = Math.min(last, Math.floor(positions[g] + frame.lobeBins));
    for (let k = lo; k <= hi; k++) fitted[k] = 1;
  }
  const bins: number[] = [];
  for (let k = 0; k <= last; k++) if (fitted[k]) bins.push(k);
  return { positions, column, unknowns: 2 * count + 1, bins };
}

/** Complex coefficients of every unknown at bin k (interleaved re, im), zero when too far to couple. */
function rowAt(frame: SpectralFrame, lay: Layout, k: number, row: Float64Array): void {
  row.fill(0);
  const reach = (COUPLING_BINS * frame.spectrum.size) / frame.length;
  const size = frame.spectrum.size;
  for (let g = 0; g < lay.positions.length; g++) {
    const p = lay.positions[g];
    const nearImage = Math.min(Math.abs(k + p), Math.abs(size - k - p));
    if (Math.abs(k - p) > reach && nearImage > reach) continue;
    const wm = frameKernel(frame, k - p);
    const u = lay.column[g];
    if (g === 0) {
      row[2 * u] = wm.re;
      row[2 * u + 1] = wm.im;
      continue;
    }
    const wp = nearImage > reach ? { re: 0, im: 0 } : frameKernel(frame, k + p);
    // ½c·W(k−p) + ½c̄·W(k+p) with c = a + ib: coefficient of a is (Wm + Wp)/2, of b is i(Wm − Wp)/2.
    row[2 * u] = (wm.re + wp.re) / 2;
    row[2 * u + 1] = (wm.im + wp.im) / 2;
    row[2 * u + 2] = -(wm.im - wp.im) / 2;
    row[2 * u + 3] = (wm.re - wp.re) / 2;
  }
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
  const u = lay.unknowns;
  const normal = new Float64Array(u * u);
  const rhs = new Float64Array(u);
  const row = new Float64Array(2 * u);
  const s = frame.spectrum;
  let total = 0;
  for (const k of lay.bins) {
    rowAt(frame, lay, k, row);
    accumulate(normal, rhs, row, u, s.re(k), s.im(k));
    total += s.power(k);
  }
  let maxDiag = 0;
  for (let i = 0; i < u; i++) maxDiag = Math.max(maxDiag, normal[i * u + i]);
  for (let i = 0; i < u; i++) normal[i * u + i] += 1e-14 * maxDiag;
  const x = choleskySolve(normal, rhs, u);
  if (x === null) return null;
  // At the least-squares solution ‖X − Ax‖² = ‖X‖² − xᵀAᵀX (normal equations), so no second pass.
  let explained = 0;
  for (let i = 0; i < u; i++) explained += x[i] * rhs[i];
  return summarise(frame, x, fundamental, count, Math.max(0, total - explained), lay.bins.length);
}

function accumulate(normal: Float64Array, rhs: Float64Array, row: Float64Array, u: number, xr: number, xi: number): void {
  for (let a = 0; a < u; a++) {
    const ar = row[2 * a];
    const ai = row[2 * a + 1];
    if (ar === 0 && ai === 0) continue;
    rhs[a] += ar * xr + ai * xi;
    for (let b = a; b < u; b++) {
      const v = ar * row[2 * b] + ai * row[2 * b + 1];
      normal[a * u + b] += v;
      if (b !== a) normal[b * u + a] += v;
    }
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
  const lay = layout(frame, fit.fundamental, fit.count);
  const u = lay.unknowns;
  const row = new Float64Array(2 * u);
  const s = frame.spectrum;
  const p = lay.positions[n];
  let residual = 0;
  let total = 0;
  const lo = Math.max(0, Math.ceil(p - frame.lobeBins));
  const hi = Math.min(s.bins - 1, Math.floor(p + frame.lobeBins));
  for (let k = lo; k <= hi; k++) {
    rowAt(frame, lay, k, row);
    let mr = 0;
    let mi = 0;
    for (let a = 0; a < u; a++) {
      mr += row[2 * a] * fit.coefficients[a];
      mi += row[2 * a + 1] * fit.coefficients[a];
    }
    residual += (s.re(k) - mr) ** 2 + (s.im(k) - mi) ** 2;
    total += s.power(k);
  }
  return total > 0 ? residual / total : 0;
}
