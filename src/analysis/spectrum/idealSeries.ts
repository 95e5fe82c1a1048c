/**
 * Ideal harmonic series of the recognised shape, normalised to its fundamental (index n holds
 * |b_n|/|b_1|; index 0 unused). Fourier series from any signals text (e.g. J. O. Smith, UCSD
 * "standard periodic waveforms"; REFERENCES §4): triangle 8A/(π²n²) odd n, square 4A/(πn) odd n,
 * sawtooth 2A/(πn) all n, pulse of duty D (2A/(πn))·|sin(nπD)|, sine the fundamental alone.
 */
import type { Shape } from '../../types/index.js';

export function idealSeries(shape: Shape, count: number, duty?: number): Float64Array | null {
  const r = new Float64Array(count + 1);
  for (let n = 1; n <= count; n++) r[n] = term(shape, n, duty);
  if (!Number.isFinite(r[1]) || r[1] <= 0) return null;
  const b1 = r[1];
  for (let n = 1; n <= count; n++) r[n] /= b1;
  return r;
}

function term(shape: Shape, n: number, duty: number | undefined): number {
  switch (shape) {
    case 'sine':
      return n === 1 ? 1 : 0;
    case 'triangle':
      return n % 2 === 1 ? 1 / (n * n) : 0;
    case 'square':
      return n % 2 === 1 ? 1 / n : 0;
    case 'sawtooth':
      return 1 / n;
    case 'pulse':
      return duty === undefined ? Number.NaN : Math.abs(Math.sin(n * Math.PI * duty)) / n;
    case 'unknown':
      return Number.NaN;
  }
}
