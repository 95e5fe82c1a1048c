/**
 * Shape error: how far the measured harmonic series departs from the recognised shape's ideal
 * series, as one percentage.
 *
 * Definition (ours, documented in the method text): with m_n = A_n/A_1 measured and r_n the
 * ideal series normalised the same way (idealSeries.ts), n = 1…N,
 *   shapeError = 100 · √(Σ (m_n − r_n)²) / √(Σ r_n²)  %,
 * the rms difference of the normalised series relative to the ideal series' rms. Magnitudes only:
 * a ramp that bends or a rounded corner changes the magnitudes, so phases are not needed. For a
 * sine it equals THD over harmonics 2…N (both less the noise bias of the fitted amplitudes). Uncertainty: σ_A/A_1 per term, √N terms, over √Σr².
 */
import type { MeasureResult, Shape } from '../../types/index.js';
import type { HarmonicAnalysis } from './harmonicAnalysis.js';

export function shapeError(h: HarmonicAnalysis, shape: Shape, ideal: Float64Array | null, idealNote: string): MeasureResult {
  if (ideal === null) {
    return { ok: false, reason: 'not-applicable', detail: `no ideal harmonic series for shape "${shape}"${idealNote ? `: ${idealNote}` : ''}` };
  }
  const { fit, reported } = h;
  const a1 = fit.amplitude[1];
  let diff = 0;
  let norm = 0;
  for (let n = 1; n <= reported; n++) {
    diff += (fit.amplitude[n] / a1 - ideal[n]) ** 2;
    norm += ideal[n] ** 2;
  }
  // Each measured m_n² carries 2σ_A²/A₁² of noise on average (n ≥ 2); taken out as in thd.ts.
  const bias = (2 * (reported - 1) * h.amplitudeSigma ** 2) / (a1 * a1);
  const rel = Math.sqrt(Math.max(0, diff - bias) / norm);
  const u = Math.hypot((h.amplitudeSigma / a1) * Math.sqrt(reported / norm), rel * h.mismatch);
  return {
    ok: true,
    value: 100 * rel,
    uncertainty: 100 * u,
    unit: '%',
    method: `rms difference between the measured and the ideal ${shape}${idealNote ? ` (${idealNote})` : ''} harmonic magnitudes 1–${reported}, both normalised to the fundamental, over the ideal series' rms`,
  };
}
