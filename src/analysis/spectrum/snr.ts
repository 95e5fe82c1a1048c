/**
 * Signal-to-noise ratio in dB (IEEE Std 1241, SNR: signal power over the noise with the
 * harmonics excluded). For a sine the signal is the fundamental and the harmonics 2…N fitted are
 * excluded from the noise. For any other periodic shape the whole periodic waveform is the
 * signal: its power is the span's variance less the noise, and the noise is read between all
 * harmonic lobes up to Nyquist, so a triangle's own harmonics are never counted as noise.
 *
 * Uncertainty: the noise is a mean over B bins of a windowed spectrum, about B·L/(M·ENBW)
 * independent ones, so its relative scatter is 1/√(that); in dB, 4.34 times it.
 */
import type { MeasureResult, Shape } from '../../types/index.js';
import type { HarmonicAnalysis } from './harmonicAnalysis.js';
import type { NoiseFloor } from './noiseFloor.js';
import type { SpectralFrame } from './spectralFrame.js';

export function snr(h: HarmonicAnalysis, shape: Shape): MeasureResult {
  const sine = shape === 'sine';
  const noise = sine ? h.noise : h.noiseBetweenAll;
  if (noise === null) {
    return { ok: false, reason: 'too-few-cycles', detail: 'the harmonic lobes cover the spectrum, leaving no bins to read the noise from; capture more cycles' };
  }
  const signal = sine ? h.fit.amplitude[1] ** 2 / 2 : h.frame.variance - noise.variance;
  if (!(signal > 0) || !(noise.variance > 0)) {
    return { ok: false, reason: 'no-signal', detail: 'no signal power above the noise' };
  }
  return {
    ok: true,
    value: 10 * Math.log10(signal / noise.variance),
    uncertainty: noiseDbUncertainty(h.frame, noise),
    unit: 'dB',
    method: sine
      ? `fundamental power over the noise read between the lobes of harmonics 1–${h.fit.count} (IEEE 1241 SNR)`
      : 'power of the periodic waveform (all harmonics) over the noise read between all harmonic lobes up to Nyquist',
  };
}

/** Standard uncertainty in dB of a power ratio whose denominator is the mean noise of `noise.bins` bins. */
export function noiseDbUncertainty(frame: SpectralFrame, noise: NoiseFloor): number {
  const enbw = (frame.length * frame.s2) / (frame.s1 * frame.s1);
  const independent = Math.max(1, (noise.bins * frame.length) / (frame.spectrum.size * enbw));
  return (10 / Math.LN10) / Math.sqrt(independent);
}
