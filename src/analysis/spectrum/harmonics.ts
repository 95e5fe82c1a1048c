/**
 * The harmonic table: amplitude of harmonics 1…N (the first 50 by default; the sums take more) from the shared least-squares fit
 * (harmonicAnalysis.ts), each in dBc, with the recognised shape's ideal level beside it
 * (idealSeries.ts). Levels below 1e-20 of the fundamental are written as −400 dBc so the table
 * stays finite in JSON.
 */
import type { Harmonic } from '../../types/index.js';
import type { HarmonicAnalysis } from './harmonicAnalysis.js';

const MIN_RATIO = 1e-20;
/** Ideal terms smaller than this (e.g. sin(nπD) for nD whole) are zeros of the series. */
const IDEAL_ZERO = 1e-12;

export function dbc(ratio: number): number {
  return 20 * Math.log10(Math.max(MIN_RATIO, ratio));
}

export function harmonics(h: HarmonicAnalysis, ideal: Float64Array | null): Harmonic[] {
  const { fit, tabled } = h;
  const a1 = fit.amplitude[1];
  const out: Harmonic[] = [];
  for (let n = 1; n <= tabled; n++) {
    const row = { n, frequency: n * fit.fundamental, amplitude: fit.amplitude[n], dbc: dbc(fit.amplitude[n] / a1) };
    const r = ideal === null ? 0 : ideal[n];
    out.push(r > IDEAL_ZERO ? { ...row, idealDbc: dbc(r) } : row);
  }
  return out;
}
