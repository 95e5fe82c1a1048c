/**
 * The shared fit behind every harmonic measurement: one least-squares multi-harmonic fit at the
 * time-domain fundamental (harmonicFit.ts), the noise read from the bins between the harmonics,
 * and the standard uncertainty of one fitted amplitude.
 *
 * Amplitude uncertainty: a bin's noise has variance σ²·Σw² and a tone reads A·Σw/2, so one
 * quadrature of a fitted amplitude scatters by σ·√(2Σw²)/Σw (Heinzel et al. 2002, §9; the same
 * factor is √(2·ENBW/L)·σ). A floor of 1e-7 of the fundamental (−140 dBc) stands for the
 * window's far sidelobes of components outside the fit (see harmonicFit.ts).
 * The set summed is every harmonic below Nyquist by default (THD over the full series), or the count or
 * bandwidth a design states; the banded fit keeps the cost linear in the number of harmonics.
 */
import type { WithheldReason } from '../../types/index.js';
import { fitHarmonics, lobeResidualShare, type HarmonicFit } from './harmonicFit.js';
import { noiseFloors, type NoiseFloor } from './noiseFloor.js';
import type { SpectralFrame } from './spectralFrame.js';
import { WINDOW_LABELS } from './windows.js';

/** Fewest whole cycles in the span for the joint fit to separate the harmonic lobes. */
export const MIN_CYCLES = 3;
/** Unexplained share of the fundamental's lobe above which the fit is refused (−30 dB). */
const MAX_RESIDUAL_SHARE = 1e-3;
const FLOOR_DBC = 1e-7;

/** Which harmonics the sums (THD, shape error, even/odd balance) take; every one below Nyquist by default. */
export interface HarmonicSet {
  /** Highest harmonic summed, when a design is specified over a fixed count. */
  readonly harmonics?: number;
  /** Highest frequency summed (Hz), when a design is specified over a bandwidth. */
  readonly bandwidth?: number;
}

export interface HarmonicAnalysis {
  readonly frame: SpectralFrame;
  readonly fit: HarmonicFit;
  /** Harmonics summed, 1…reported: every fitted one, unless a count or bandwidth was asked for. */
  readonly reported: number;
  /** Harmonics listed in the table, 1…tabled (at most `reported`). */
  readonly tabled: number;
  /** Noise between the fitted harmonics, and between all harmonics up to Nyquist. */
  readonly noise: NoiseFloor | null;
  readonly noiseBetweenAll: NoiseFloor | null;
  /** Standard uncertainty of one fitted amplitude, V. */
  readonly amplitudeSigma: number;
  /** Relative standard uncertainty from model mismatch (√ of the unexplained share at the fundamental). */
  readonly mismatch: number;
  /** The harmonic set summed, in words (which ones, and which were left out and why). */
  readonly set: string;
  readonly method: string;
}

export type Withheld = { readonly ok: false; readonly reason: WithheldReason; readonly detail: string };

/**
 * Every harmonic whose main lobe lies wholly below Nyquist is fitted: one closer than a lobe
 * half-width to Nyquist overlaps its own alias (a component at f_s − n·f₀ has the same lobe mirrored),
 * so the two cannot be told apart and it is left out of the fit and the sums; its power counts as noise.
 */
export function analyseHarmonics(frame: SpectralFrame, fundamental: number, maxHarmonic: number, wanted: HarmonicSet = {}): HarmonicAnalysis | Withheld {
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
  const count = Math.max(1, Math.min(belowNyquist, Math.floor((nyquist - margin) / fundamental)));
  const byBandwidth = wanted.bandwidth !== undefined ? Math.floor(wanted.bandwidth / fundamental) : count;
  const reported = Math.max(1, Math.min(count, wanted.harmonics ?? count, byBandwidth));
  const fit = fitHarmonics(frame, fundamental, count);
  if (fit === null) return { ok: false, reason: 'fit-failed', detail: 'the harmonic least-squares system is singular' };
  const share = lobeResidualShare(frame, fit, 1);
  if (share > MAX_RESIDUAL_SHARE) {
    const db = (10 * Math.log10(share)).toFixed(1);
    return { ok: false, reason: 'fit-failed', detail: `the spectrum at ${fundamental} Hz is not a steady tone (unexplained ${db} dB of the fundamental's lobe): the frequency drifted or the measured fundamental is off` };
  }
  // Both floors in one pass over the bins (they differ only near Nyquist).
  const [noise, noiseBetweenAll] = noiseFloors(frame, fundamental, count, belowNyquist);
  const sigma = noise === null ? 0 : Math.sqrt((2 * noise.variance * frame.s2) / (frame.s1 * frame.s1));
  const amplitudeSigma = Math.hypot(sigma, FLOOR_DBC * fit.amplitude[1]);
  const set = setWords(reported, count, belowNyquist, wanted);
  const method = `least-squares multi-harmonic fit at the measured fundamental ${formatHz(fundamental)} over the main lobes of harmonics 1–${count} of a ${frame.length}-sample ${WINDOW_LABELS[frame.window]} spectrum; ${set}`;
  return { frame, fit, reported, tabled: Math.min(reported, maxHarmonic), noise, noiseBetweenAll, amplitudeSigma, mismatch: Math.sqrt(share), set, method };
}

function setWords(reported: number, count: number, belowNyquist: number, wanted: HarmonicSet): string {
  const which =
    reported < count
      ? `harmonics 1–${reported} (${wanted.harmonics !== undefined && reported === wanted.harmonics ? `the ${wanted.harmonics} harmonics asked for` : `up to the ${formatHz(wanted.bandwidth ?? 0)} bandwidth asked for`})`
      : `every harmonic below Nyquist, 1–${count}`;
  const left = belowNyquist > count ? `; harmonic${belowNyquist - count > 1 ? `s ${count + 1}–${belowNyquist} lie` : ` ${belowNyquist} lies`} within a main lobe of Nyquist, overlap${belowNyquist - count > 1 ? '' : 's'} ${belowNyquist - count > 1 ? 'their' : 'its'} own alias and count${belowNyquist - count > 1 ? '' : 's'} as noise` : '';
  return `N = ${reported}: ${which}${left}`;
}

export function formatHz(f: number): string {
  return `${Number(f.toPrecision(7))} Hz`;
}
