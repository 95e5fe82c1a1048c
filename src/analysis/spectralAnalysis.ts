// Placeholder with the agreed signature until the frequency-domain analysis lands; replaced, not kept.
import type { Harmonic, MeasureResult, MeasurementId, Shape, SpectrumPlot } from '../types/index.js';

export interface SpectralOptions {
  /** Highest harmonic to report (default 50, or up to Nyquist). */
  readonly maxHarmonic?: number;
  /** Build the decimated spectrum for plots. */
  readonly plot?: boolean;
  /** The channel is clipped: THD and harmonic levels are withheld. */
  readonly clipped?: boolean;
}

export interface SpectralResult {
  /** thd, snr, sinad, sfdr, enob, humFrequency, humLevel, shapeError, evenOddRatio (those that apply). */
  readonly measurements: Partial<Record<MeasurementId, MeasureResult>>;
  readonly harmonics: readonly Harmonic[];
  readonly harmonicsMethod: string;
  readonly spectrum?: SpectrumPlot;
}

/**
 * Frequency-domain measurements of one channel. `fundamental` comes from the time-domain frequency
 * measurement; null when it was withheld (then only hum and the plot are attempted).
 */
export function analyzeSpectrum(
  _samples: Float64Array,
  _dt: number,
  _fundamental: number | null,
  _shape: Shape,
  _options: SpectralOptions = {},
): SpectralResult {
  return { measurements: {}, harmonics: [], harmonicsMethod: 'not yet available' };
}
