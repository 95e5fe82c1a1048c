/**
 * SINAD and ENOB of a sine (IEEE Std 1241 and 1057): SINAD = 10·log10(P_fundamental / P_NAD)
 * where noise-and-distortion is everything but DC and the fundamental below Nyquist, read as IEEE
 * 1241 reads it from a DFT: the power of every bin outside the DC and fundamental main lobes (white
 * noise of variance σ² puts σ²·Σw² in each, Heinzel et al. 2002 §9), with those two lobes filled at the
 * noise level read between the harmonics. Summing the bins, not fitted harmonics over a white-noise
 * model, keeps what lies at a harmonic near Nyquist or at a near-coherent ratio's few sample phases
 * (where quantisation error gathers on the harmonics rather than spreading evenly).
 * ENOB = (SINAD − 1.76)/6.02 (IEEE 1241 frequency-domain form; 6.02 = 20·log10 2,
 * 1.76 = 10·log10 1.5). Both treat harmonics as distortion, so they are reported for a sine only.
 */
import type { MeasureResult, Shape } from '../../types/index.js';
import type { HarmonicAnalysis } from './harmonicAnalysis.js';
import type { NoiseFloor } from './noiseFloor.js';
import { LobeScan } from './noiseFloor.js';
import { frameKernel } from './spectralFrame.js';
import { noiseDbUncertainty } from './snr.js';

export function sinad(h: HarmonicAnalysis, shape: Shape): MeasureResult {
  if (shape !== 'sine') {
    return { ok: false, reason: 'not-applicable', detail: `SINAD counts harmonics as distortion; a ${shape} is made of harmonics, so it is defined for a sine only` };
  }
  const { fit, noise } = h;
  if (noise === null) {
    return { ok: false, reason: 'too-few-cycles', detail: 'the harmonic lobes cover the spectrum, leaving no bins to read the noise from; capture more cycles' };
  }
  const nad = noiseAndDistortion(h, noise);
  if (!(nad > 0)) return { ok: false, reason: 'below-noise', detail: 'no noise or distortion above the numerical floor' };
  return {
    ok: true,
    value: 10 * Math.log10(fit.amplitude[1] ** 2 / 2 / nad),
    uncertainty: noiseDbUncertainty(h.frame, noise) * (noise.variance / nad),
    unit: 'dB',
    method: `fundamental power over everything else below Nyquist but DC (IEEE 1241 SINAD): every bin outside the DC and fundamental lobes, harmonics and aliases included, the two lobes filled with the noise between harmonics; fundamental by ${h.method}`,
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

/** Bins around the fundamental (and DC) where its window sidelobes are taken out before summing: beyond, under −134 dB (harmonicFit.ts). */
const LEAKAGE_BINS = 256;

/**
 * Noise-and-distortion variance: bins outside the DC and fundamental lobes, those lobes at the noise
 * level. Within 256 window bins of the fundamental and of DC the fitted DC and fundamental are
 * subtracted first, so their window sidelobes (up to −92 dB for the 4-term Blackman-Harris window,
 * Harris 1978) are not taken for noise: a 16-bit converter's noise lies near −98 dB.
 */
function noiseAndDistortion(h: HarmonicAnalysis, noise: NoiseFloor): number {
  const { frame, fit } = h;
  const s = frame.spectrum;
  const p = fit.fundamental / frame.binWidth;
  const reach = (LEAKAGE_BINS * s.size) / frame.length;
  const [c0, a, b] = [fit.coefficients[0], fit.coefficients[1], fit.coefficients[2]];
  const lobes = new LobeScan(frame.lobeBins, p, 1);
  let sum = 0;
  let excluded = 0;
  for (let k = 1; k < s.bins - 1; k++) {
    if (lobes.covers(k)) {
      excluded++;
      continue;
    }
    if (Math.abs(k - p) > reach && k > reach) {
      sum += s.power(k);
      continue;
    }
    // Model of DC and the fundamental at bin k (harmonicFit.ts): c₀W(k) + ½c·W(k − p) + ½c̄·W(k + p).
    const w0 = frameKernel(frame, k);
    const wm = frameKernel(frame, k - p);
    const wp = frameKernel(frame, k + p);
    const re = c0 * w0.re + (a * (wm.re + wp.re) - b * (wm.im - wp.im)) / 2;
    const im = c0 * w0.im + (a * (wm.im + wp.im) + b * (wm.re - wp.re)) / 2;
    sum += (s.re(k) - re) ** 2 + (s.im(k) - im) ** 2;
  }
  return (sum + excluded * noise.perBin) / (frame.s2 * (s.bins - 2));
}
