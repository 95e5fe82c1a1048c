/**
 * Decimated level spectrum for plots: bins from 0 Hz up to 20 × the fundamental (or Nyquist),
 * at most MAX_POINTS points, each the largest bin of its group (a peak hold, so a harmonic
 * never falls between plotted points). Levels are dB relative to `reference` (peak volts),
 * with a bin read as a tone of amplitude 2|X|/Σw (coherent gain, Heinzel et al. 2002, §9);
 * rounded to 0.01 dB and floored at −300 dB so the plot stays finite in JSON.
 */
import type { SpectrumPlot } from '../../types/index.js';
import type { SpectralFrame } from '../spectrum/spectralFrame.js';
import { WINDOW_LABELS } from '../spectrum/windows.js';

const MAX_POINTS = 2000;
const SPAN_HARMONICS = 20;
const FLOOR_DB = -300;

export function spectrumPlot(frame: SpectralFrame, fundamental: number | null, reference: number, referenceName = 'fundamental'): SpectrumPlot {
  const s = frame.spectrum;
  const top = fundamental === null ? frame.sampleRate / 2 : Math.min(frame.sampleRate / 2, SPAN_HARMONICS * fundamental);
  const last = Math.min(s.bins - 1, Math.floor(top / frame.binWidth));
  const group = Math.max(1, Math.ceil((last + 1) / MAX_POINTS));
  const dbc: number[] = [];
  for (let start = 0; start <= last; start += group) {
    let peak = 0;
    for (let k = start; k < Math.min(start + group, last + 1); k++) {
      peak = Math.max(peak, (2 * s.magnitude(k)) / frame.s1 / frame.response(k * frame.binWidth));
    }
    const level = peak > 0 && reference > 0 ? 20 * Math.log10(peak / reference) : FLOOR_DB;
    dbc.push(Math.round(Math.max(FLOOR_DB, level) * 100) / 100);
  }
  return { binWidth: group * frame.binWidth, dbc, window: WINDOW_LABELS[frame.window], reference: referenceName };
}
