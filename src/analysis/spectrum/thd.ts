/**
 * Total harmonic distortion THD_F = √(Σ_{n=2..N} A_n²) / A_1, in percent, with N stated.
 * Definition: IEC 60050 (IEV) "total harmonic distortion" and IEEE Std 1241's THD (rss of the
 * harmonics over the fundamental; the harmonic set must be stated). Takes the shared harmonic
 * fit rather than samples, because every harmonic measurement reads the same fit.
 *
 * Uncertainty (GUM linear propagation of the amplitude uncertainty σ_A through THD = H/A_1):
 * u = (σ_A/A_1)·√(1 + THD²), plus THD·ρ for the model mismatch ρ.
 * Harmonic set: every harmonic below Nyquist by default (harmonicAnalysis.ts), so a square's THD is
 * the Fourier-series value to within the harmonics Nyquist cuts off; when the summed harmonics do not
 * stand above twice their noise bias the result is an upper bound.
 */
import type { MeasureResult } from '../../types/index.js';
import type { HarmonicAnalysis } from './harmonicAnalysis.js';
import { bounded } from '../measureResult.js';

export function thd(h: HarmonicAnalysis): MeasureResult {
  const { fit, reported } = h;
  const a1 = fit.amplitude[1];
  if (reported < 2) {
    return { ok: false, reason: 'aliasing', detail: `the 2nd harmonic (${2 * fit.fundamental} Hz) is not below Nyquist; sample faster to measure THD` };
  }
  let sum = 0;
  for (let n = 2; n <= reported; n++) sum += fit.amplitude[n] ** 2;
  // Each fitted A_n² carries the noise of its two quadratures, 2σ_A² on average; over hundreds of
  // harmonics that bias adds up, so it is taken out (IEEE 1241 notes noise in the harmonic bins).
  const bias = 2 * (reported - 1) * h.amplitudeSigma ** 2;
  if (sum <= 2 * bias) {
    const bound = (100 * Math.sqrt(sum + 2 * bias)) / a1;
    return bounded('upper', bound, `harmonics 2–${reported} do not stand above their noise`, `upper bound: rss of harmonics 2–${reported} with twice their noise bias, over the fundamental; ${h.set}`);
  }
  const ratio = Math.sqrt(sum - bias) / a1;
  const u = Math.hypot((h.amplitudeSigma / a1) * Math.sqrt(1 + ratio * ratio), ratio * h.mismatch);
  return {
    ok: true,
    value: 100 * ratio,
    uncertainty: 100 * u,
    unit: '%',
    method: `rms of harmonics 2–${reported} over the fundamental (THD_F, IEEE 1241), less their noise bias; amplitudes by ${h.method}`,
  };
}
