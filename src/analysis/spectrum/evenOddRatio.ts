/**
 * Even/odd balance in dB: 10·log10(E/O) with E = Σ A_n² over even n = 2…N and O = Σ A_n² over
 * odd n = 3…N (the fundamental left out, so the figure says how the distortion splits, not how
 * large it is). A waveform with half-wave symmetry, x(t + T/2) = −x(t), has no even harmonics
 * (any Fourier-series text, e.g. Kreyszig, Advanced Engineering Mathematics, §11.2), so even
 * energy betrays an asymmetric triangle or a duty cycle off 50 %.
 *
 * Each A_n² carries a noise bias of 2σ_A² (two quadratures). When E (or O) is not above four
 * times its bias the ratio is withheld as below the noise; when only the even side is, the ratio
 * comes with that upper bound.
 */
import type { MeasureResult } from '../../types/index.js';
import type { HarmonicAnalysis } from './harmonicAnalysis.js';
import { bounded } from '../measureResult.js';

const DETECT = 4;

export function evenOddRatio(h: HarmonicAnalysis): MeasureResult {
  const { fit, reported } = h;
  if (reported < 3) {
    return { ok: false, reason: 'aliasing', detail: `the 3rd harmonic (${3 * fit.fundamental} Hz) is not below Nyquist` };
  }
  let even = 0;
  let odd = 0;
  let evenCount = 0;
  let oddCount = 0;
  // Powers relative to the fundamental's (the ratio is free of scale): squares of amplitudes near
  // 1e-158 V would underflow to zero in double precision and leave 0/0.
  const ref = fit.amplitude[1] > 0 && Number.isFinite(fit.amplitude[1]) ? fit.amplitude[1] : 1;
  for (let n = 2; n <= reported; n++) {
    if (n % 2 === 0) {
      even += (fit.amplitude[n] / ref) ** 2;
      evenCount++;
    } else {
      odd += (fit.amplitude[n] / ref) ** 2;
      oddCount++;
    }
  }
  const bias = 2 * (h.amplitudeSigma / ref) ** 2;
  const evenFloor = DETECT * bias * evenCount;
  const oddFloor = DETECT * bias * oddCount;
  if (odd <= oddFloor) {
    return { ok: false, reason: 'below-noise', detail: `odd harmonics 3–${reported} are below the noise; there is no balance to report` };
  }
  if (even <= evenFloor && !(evenFloor > 0)) {
    // No even power and no noise to bound it by: nothing finite can be said.
    return { ok: false, reason: 'below-noise', detail: `even harmonics 2–${reported} are zero within the fit and the fit states no noise to bound them` };
  }
  if (even <= evenFloor) {
    const bound = 10 * Math.log10(evenFloor / odd);
    return bounded(
      'upper',
      bound,
      `even harmonics 2–${reported} are below the noise: the ratio is below ${bound.toFixed(1)} dB`,
      `upper bound: even harmonics 2–${reported} all under ${DETECT} times their noise bias 2σ_A², over the power of odd harmonics 3–${reported}`,
    );
  }
  const u = (10 / Math.LN10) * Math.hypot((2 * h.amplitudeSigma) / Math.sqrt(even), (2 * h.amplitudeSigma) / Math.sqrt(odd));
  return {
    ok: true,
    value: 10 * Math.log10(even / odd),
    uncertainty: u,
    unit: 'dB',
    method: `power of even harmonics 2–${reported} over power of odd harmonics 3–${reported}, from the harmonic fit`,
  };
}
