/**
 * The shared fit behind every harmonic measurement: one least-squares multi-harmonic fit at the
 * time-domain fundamental (harmonicFit.ts), the noise read from the bins between the harmonics,
 * and the standard uncertainty of one fitted amplitude.
 *
 * Amplitude uncertainty: a bin's noise has variance σ²·Σw² and a tone reads A·Σw/2, so one
 * quadrature of a fitted amplitude scatters by σ·√(2Σw²)/Σw (Heinzel et al. 2002, §9; the same
 * factor is √(2·ENBW/L)·σ). A floor of 1e-7 of the fundamental (−140 dBc) stands for the
 * window's far sidelobes of components outside the fit (see harmonicFit.ts).
 */
import type { WithheldReason } from '../types/index.js';
import { fitHarmonics, lobeResidualShare, type HarmonicFit } from './harmonicFit.js';
import { noiseFloor, type NoiseFloor } from './noiseFloor.js';
import type { SpectralFrame } from './spectralFrame.js';
import { WINDOW_LABELS } from './windows.js';

/** Fewest whole cycles in the span for the joint fit to separate the harmonic lobes. */
export const MIN_CYCLES = 3;
/** Harmonics fitted beyond the last one reported, so their lobes do not leak into it. */
const GUARD_HARMONICS = 4;
/** Unexplained share of the fundamental's lobe above which the fit is refused (−30 dB). */
const MAX_RESIDUAL_SHARE = 1e-3;
const FLOOR_DBC = 1e-7;

export interface HarmonicAnalysis {
  readonly frame: SpectralFrame;
  readonly fit: HarmonicFit;
  /** Harmonics reported, 1…reported (their main lobes lie wholly below Nyquist). */
  readonly reported: number;
  /** Noise between the fitted harmonics, and between all harmonics up to Nyquist. */
  readonly noise: NoiseFloor | null;
  readonly noiseBetweenAll: NoiseFloor | null;
  /** Standard uncertainty of one fitted amplitude, V. */
  readonly amplitudeSigma: number;
  /** Relative standard uncertainty from model mismatch (√ of the unexplained share at the fundamental). */
  readonly mismatch: number;
  readonly method: string;
}

export type Withheld = { readonly ok: false; readonly reason: WithheldReason; readonly detail: string };

export function analyseHarmonics(frame: SpectralFrame, fundamental: number, maxHarmonic: number): HarmonicAnalysis | Withheld {
  const nyquist = frame.sampleRate / 2;
  if (!(fundamental > 0) || fundamental >= nyquist) {
    return { ok: false, reason: 'aliasing', detail: `fundamental ${fundamental} Hz is not below Nyquist (${nyquist} Hz)` };
  }
  const cycles = (frame.length * fundamental) / frame.sampleRate;
  if (cycles < MIN_CYCLES) {
    return { ok: false, reason: 'too-few-cycles', detail: `the analysed span holds ${cycles.toFixed(2)} cycles; harmonic analysis needs at least ${MIN_CYCLES}` };
  }
  const margin = frame.lobeBins * frame.binWidth;
  const belowNyquist = Math.ceil(nyquist / fundamental) - 1;
  const reported = Math.max(1, Math.min(maxHarmonic, Math.floor((nyquist - margin) / fundamental)));
  const count = Math.min(belowNyquist, reported + GUARD_HARMONICS);
  const fit = fitHarmonics(frame, fundamental, count);
  if (fit === null) return { ok: false, reason: 'fit-failed', detail: 'the harmonic least-squares system is singular' };
  const share = lobeResidualShare(frame, fit, 1);
  if (share > MAX_RESIDUAL_SHARE) {
    const db = (10 * Math.log10(share)).toFixed(1);
    return { ok: false, reason: 'fit-failed', detail: `the spectrum at ${fundamental} Hz is not a steady tone (unexplained ${db} dB of the fundamental's lobe): the frequency drifted or the measured fundamental is off` };
  }
  const noise = noiseFloor(frame, fundamental, count);
  const noiseBetweenAll = noiseFloor(frame, fundamental, belowNyquist);
  const sigma = noise === null ? 0 : Math.sqrt((2 * noise.variance * frame.s2) / (frame.s1 * frame.s1));
  const amplitudeSigma = Math.hypot(sigma, FLOOR_DBC * fit.amplitude[1]);
  const method = `least-squares multi-harmonic fit at the measured fundamental ${formatHz(fundamental)} over the main lobes of harmonics 1–${count} of a ${frame.length}-sample ${WINDOW_LABELS[frame.window]} spectrum, N = ${reported}`;
  return { frame, fit, reported, noise, noiseBetweenAll, amplitudeSigma, mismatch: Math.sqrt(share), method };
}

export function formatHz(f: number): string {
  return `${Number(f.toPrecision(7))} Hz`;
}
