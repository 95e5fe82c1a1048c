/**
 * SINAD and ENOB of a sine (IEEE Std 1241 and 1057): SINAD = 10·log10(P_fundamental / P_NAD)
 * where noise-and-distortion is everything but DC and the fundamental below Nyquist, here the
 * noise read between the harmonic lobes (noiseFloor.ts) plus the fitted harmonics 2…N.
 * ENOB = (SINAD − 1.76)/6.02 (IEEE 1241 frequency-domain form; 6.02 = 20·log10 2,
 * 1.76 = 10·log10 1.5). Both treat harmonics as distortion, so they are reported for a sine only.
 */
import type { MeasureResult, Shape } from '../types/index.js';
import type { HarmonicAnalysis } from './harmonicAnalysis.js';
import { noiseDbUncertainty } from './snr.js';

export function sinad(h: HarmonicAnalysis, shape: Shape): MeasureResult {
  if (shape !== 'sine') {
    return { ok: false, reason: 'not-applicable', detail: `SINAD counts harmonics as distortion; a ${shape} is made of harmonics, so it is defined for a sine only` };
  }
  const { fit, noise } = h;
  if (noise === null) {
    return { ok: false, reason: 'too-few-cycles', detail: 'the harmonic lobes cover the spectrum, leaving no bins to read the noise from; capture more cycles' };
  }
  let distortion = 0;
  for (let n = 2; n <= fit.count; n++) distortion += fit.amplitude[n] ** 2 / 2;
  const nad = noise.variance + distortion;
  if (!(nad > 0)) return { ok: false, reason: 'below-noise', detail: 'no noise or distortion above the numerical floor' };
  return {
    ok: true,
    value: 10 * Math.log10(fit.amplitude[1] ** 2 / 2 / nad),
    uncertainty: noiseDbUncertainty(h.frame, noise) * (noise.variance / nad),
    unit: 'dB',
    method: `fundamental power over noise and harmonics 2–${fit.count}, all below Nyquist but DC (IEEE 1241 SINAD); amplitudes by ${h.method}`,
  };
}

export function enob(sinadResult: MeasureResult): MeasureResult {
  if (!sinadResult.ok) return sinadResult;
  return {
    ok: true,
    value: (sinadResult.value - 1.76) / 6.02,
    uncertainty: sinadResult.uncertainty === null ? null : sinadResult.uncertainty / 6.02,
    unit: 'bits',
    method: '(SINAD − 1.76 dB)/6.02 dB (IEEE 1241)',
  };
}
