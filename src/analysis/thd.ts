/**
 * Total harmonic distortion THD_F = √(Σ_{n=2..N} A_n²) / A_1, in percent, with N stated.
 * Definition: IEC 60050 (IEV) "total harmonic distortion" and IEEE Std 1241's THD (rss of the
 * harmonics over the fundamental; the harmonic set must be stated). Takes the shared harmonic
 * fit rather than samples, because every harmonic measurement reads the same fit.
 *
 * Uncertainty (GUM linear propagation of the amplitude uncertainty σ_A through THD = H/A_1):
 * u = (σ_A/A_1)·√(1 + THD²), plus THD·ρ for the model mismatch ρ.
 */
import type { MeasureResult } from '../types/index.js';
import type { HarmonicAnalysis } from './harmonicAnalysis.js';

export function thd(h: HarmonicAnalysis): MeasureResult {
  const { fit, reported } = h;
  const a1 = fit.amplitude[1];
  if (reported < 2) {
    return { ok: false, reason: 'aliasing', detail: `the 2nd harmonic (${2 * fit.fundamental} Hz) is not below Nyquist; sample faster to measure THD` };
  }
  let sum = 0;
  for (let n = 2; n <= reported; n++) sum += fit.amplitude[n] ** 2;
  const ratio = Math.sqrt(sum) / a1;
  const u = Math.hypot((h.amplitudeSigma / a1) * Math.sqrt(1 + ratio * ratio), ratio * h.mismatch);
  return {
    ok: true,
    value: 100 * ratio,
    uncertainty: 100 * u,
    unit: '%',
    method: `rms of harmonics 2–${reported} over the fundamental (THD_F, IEEE 1241); amplitudes by ${h.method}`,
  };
}
