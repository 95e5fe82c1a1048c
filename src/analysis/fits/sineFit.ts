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
  let [a, b] = start;
  for (let it = 1; it <= MAX_ITERATIONS; it++) {
    const step = solveLinear(...normalEquations(samples, dt, w, [a, b]));
    if (!step) return null;
    const [na, nb, c, dw] = step;
    [a, b] = [na, nb];
    w += dw;
    if (!Number.isFinite(w) || Math.abs(w / (2 * Math.PI) - frequencyGuess) > 0.1 * frequencyGuess) return null;
    if (Math.abs(dw) <= 1e-12 * w) return finish(samples, dt, w, a, b, c, it);
  }
  return null;
}

function finish(x: Float64Array, dt: number, w: number, a: number, b: number, c: number, iterations: number): SineFit | null {
  const [m] = normalEquations(x, dt, w, [a, b]);
  const rssSum = residualSquares(x, dt, w, a, b, c);
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

/**
 * Normal equations DᵀD·p = Dᵀy of the 3-parameter (ab = null) or 4-parameter fit, with columns
 * cos ωt, sin ωt, 1 and t·(−A sin ωt + B cos ωt). Written as one flat loop with scalar sums: it runs
 * over every sample several times and dominates the time spent on long sine records.
 */
function normalEquations(x: Float64Array, dt: number, w: number, ab: [number, number] | null): [number[][], number[]] {
  const a = ab ? ab[0] : 0;
  const b = ab ? ab[1] : 0;
  const n = x.length;
  const mid = (n - 1) / 2;
  const cw = Math.cos(w * dt);
  const sw = Math.sin(w * dt);
  let c = 0;
  let s = 0;
  let cc = 0, cs = 0, c1 = 0, cd = 0, ss = 0, s1 = 0, sd = 0, d1 = 0, dd = 0;
  let yc = 0, ys = 0, y1 = 0, yd = 0;
  for (let i = 0; i < n; i++) {
    if (i % RESEED === 0) {
      c = Math.cos(w * (i - mid) * dt);
      s = Math.sin(w * (i - mid) * dt);
    }
    const d = (i - mid) * dt * (-a * s + b * c);
    const y = x[i];
    cc += c * c;
    cs += c * s;
    c1 += c;
    cd += c * d;
    ss += s * s;
    s1 += s;
    sd += s * d;
    d1 += d;
    dd += d * d;
    yc += y * c;
    ys += y * s;
    y1 += y;
    yd += y * d;
    const next = c * cw - s * sw;
    s = s * cw + c * sw;
    c = next;
  }
  if (!ab) return [[[cc, cs, c1], [cs, ss, s1], [c1, s1, n]], [yc, ys, y1]];
  return [[[cc, cs, c1, cd], [cs, ss, s1, sd], [c1, s1, n, d1], [cd, sd, d1, dd]], [yc, ys, y1, yd]];
}

/** Residual sum of squares of the fitted sine, with the same phase recurrence as normalEquations. */
function residualSquares(x: Float64Array, dt: number, w: number, a: number, b: number, off: number): number {
  const n = x.length;
  const mid = (n - 1) / 2;
  const cw = Math.cos(w * dt);
  const sw = Math.sin(w * dt);
  let c = 0;
  let s = 0;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    if (i % RESEED === 0) {
      c = Math.cos(w * (i - mid) * dt);
      s = Math.sin(w * (i - mid) * dt);
    }
    const r = x[i] - a * c - b * s - off;
    sum += r * r;
    const next = c * cw - s * sw;
    s = s * cw + c * sw;
    c = next;
  }
  return sum;
}
