/**
 * Textbook Fourier-series amplitudes of the ideal shapes (peak amplitude A, zero mean), the
 * expected values of the spectral tests. Source: REFERENCES §4 (J. O. Smith, UCSD "standard
 * periodic waveforms"; Blagouchine & Moreau, IEEE Trans. Commun. 59(9), 2011):
 * square 4A/(πn) odd n, triangle 8A/(π²n²) odd n, sawtooth 2A/(πn) all n,
 * pulse of height h and duty D (2h/(πn))·|sin(nπD)|.
 */
export type SeriesShape = 'square' | 'triangle' | 'sawtooth';

export function seriesAmplitude(shape: SeriesShape, n: number, a = 1): number {
  switch (shape) {
    case 'square':
      return n % 2 === 1 ? (4 * a) / (Math.PI * n) : 0;
    case 'triangle':
      return n % 2 === 1 ? (8 * a) / (Math.PI * Math.PI * n * n) : 0;
    case 'sawtooth':
      return (2 * a) / (Math.PI * n);
  }
}

export function pulseAmplitude(n: number, height: number, duty: number): number {
  return ((2 * height) / (Math.PI * n)) * Math.abs(Math.sin(n * Math.PI * duty));
}

/** THD_F over harmonics 2…N summed from the series (the truncated values of REFERENCES §4). */
export function truncatedThd(shape: SeriesShape, last: number): number {
  let sum = 0;
  for (let n = 2; n <= last; n++) sum += seriesAmplitude(shape, n) ** 2;
  return Math.sqrt(sum) / seriesAmplitude(shape, 1);
}

/**
 * Fourier amplitude of harmonic n of one period given as a function of phase (0…1), by a plain
 * DFT of `points` samples: an implementation independent of the code under test.
 */
export function numericAmplitude(period: (phase: number) => number, n: number, points = 1 << 16): number {
  let re = 0;
  let im = 0;
  for (let i = 0; i < points; i++) {
    const v = period((i + 0.5) / points);
    re += v * Math.cos((2 * Math.PI * n * (i + 0.5)) / points);
    im += v * Math.sin((2 * Math.PI * n * (i + 0.5)) / points);
  }
  return (2 * Math.hypot(re, im)) / points;
}
