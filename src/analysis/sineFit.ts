/**
 * Four-parameter least-squares sine fit, IEEE Std 1057 (digitizing waveform recorders; the
 * 3-parameter and 4-parameter fits), as described by Kollár & Blair, IEEE Trans. Instrum. Meas.
 * 54(5), 2005: model y ≈ A·cos ωt + B·sin ωt + C; start from a 3-parameter fit at a frequency guess,
 * then repeatedly linearise about ω and solve for A, B, C and Δω until Δω is negligible.
 * Time is centred on the middle of the record, which keeps the normal equations well conditioned.
 *
 * Standard uncertainties (JCGM 100:2008 §4.2, least-squares covariance): σ̂²·(DᵀD)⁻¹ with
 * σ̂² = RSS/(N − 4), valid when the residual is white; the residual rms is reported so the caller can
 * judge that. cos/sin are advanced by rotation and re-seeded every 1024 samples to stay exact.
 */
import { solveLinear, inverseDiagonal } from './linearSystem.js';

export interface SineFit {
  readonly frequency: number;
  readonly uFrequency: number;
  /** Peak amplitude √(A² + B²). */
  readonly amplitude: number;
  readonly uAmplitude: number;
  readonly offset: number;
  readonly uOffset: number;
  readonly residualRms: number;
  readonly iterations: number;
}

const MAX_ITERATIONS = 30;
const RESEED = 1024;

export function sineFit(samples: Float64Array, dt: number, frequencyGuess: number): SineFit | null {
  const n = samples.length;
  if (n < 8 || !(frequencyGuess > 0)) return null;
  let w = 2 * Math.PI * frequencyGuess;
  const start = solveLinear(...normalEquations(samples, dt, w, null));
  if (!start) return null;
  let [a, b, c] = start;
  for (let it = 1; it <= MAX_ITERATIONS; it++) {
    const step = solveLinear(...normalEquations(samples, dt, w, [a, b]));
    if (!step) return null;
    const dw = step[3];
    [a, b, c] = step;
    w += dw;
    if (!Number.isFinite(w) || Math.abs(w / (2 * Math.PI) - frequencyGuess) > 0.1 * frequencyGuess) return null;
    if (Math.abs(dw) <= 1e-12 * w) return finish(samples, dt, w, a, b, c, it);
  }
  return null;
}

function finish(x: Float64Array, dt: number, w: number, a: number, b: number, c: number, iterations: number): SineFit | null {
  const [m] = normalEquations(x, dt, w, [a, b]);
  let rssSum = 0;
  forEachPhase(x.length, dt, w, (i, cs, sn) => {
    rssSum += (x[i] - a * cs - b * sn - c) ** 2;
  });
  const sigma2 = rssSum / (x.length - 4);
  const inv = inverseDiagonal(m);
  if (!inv) return null;
  const amplitude = Math.hypot(a, b);
  // u(R)² ≈ (A/R)²·var(A) + (B/R)²·var(B); the A–B covariance is small for many whole cycles.
  const uAmplitude = amplitude > 0 ? Math.sqrt(sigma2 * ((a / amplitude) ** 2 * inv[0] + (b / amplitude) ** 2 * inv[1])) : 0;
  return {
    frequency: w / (2 * Math.PI),
    uFrequency: Math.sqrt(sigma2 * inv[3]) / (2 * Math.PI),
    amplitude,
    uAmplitude,
    offset: c,
    uOffset: Math.sqrt(sigma2 * inv[2]),
    residualRms: Math.sqrt(rssSum / x.length),
    iterations,
  };
}

/** Normal equations DᵀD·p = Dᵀy of the 3-parameter (ab = null) or 4-parameter fit. */
function normalEquations(x: Float64Array, dt: number, w: number, ab: [number, number] | null): [number[][], number[]] {
  const p = ab ? 4 : 3;
  const m = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  const r = new Array<number>(p).fill(0);
  const col = new Array<number>(p).fill(0);
  const mid = (x.length - 1) / 2;
  forEachPhase(x.length, dt, w, (i, cs, sn) => {
    col[0] = cs;
    col[1] = sn;
    col[2] = 1;
    if (ab) col[3] = (i - mid) * dt * (-ab[0] * sn + ab[1] * cs);
    for (let j = 0; j < p; j++) {
      r[j] += col[j] * x[i];
      for (let k = j; k < p; k++) m[j][k] += col[j] * col[k];
    }
  });
  for (let j = 0; j < p; j++) for (let k = 0; k < j; k++) m[j][k] = m[k][j];
  return [m, r];
}

/** Calls f(i, cos ωtᵢ, sin ωtᵢ) with tᵢ centred on the record's middle. */
function forEachPhase(n: number, dt: number, w: number, f: (i: number, cs: number, sn: number) => void): void {
  const mid = (n - 1) / 2;
  const cd = Math.cos(w * dt);
  const sd = Math.sin(w * dt);
  let cs = 0;
  let sn = 0;
  for (let i = 0; i < n; i++) {
    if (i % RESEED === 0) {
      cs = Math.cos(w * (i - mid) * dt);
      sn = Math.sin(w * (i - mid) * dt);
    }
    f(i, cs, sn);
    const next = cs * cd - sn * sd;
    sn = sn * cd + cs * sd;
    cs = next;
  }
}
