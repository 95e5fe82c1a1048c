/**
 * The one front door to fft.js: a cached transform per power-of-two size and a half spectrum
 * read by bin. No other file sees fft.js's interleaved layout.
 *
 * Convention (checked in tests against a plain DFT): X[k] = Σ x[i]·e^(−2πi·k·i/M), k = 0…M/2.
 * Building an fft.js instance costs far more than one transform at large sizes (its twiddle
 * table; see shared/peer/MEASURED.md), hence the cache. Output goes to a Float64Array, which
 * measured as fast as a plain array here and avoids a 2M-element boxed array.
 */
import FFT from 'fft.js';

const cache = new Map<number, FFT>();

export function isPowerOfTwo(n: number): boolean {
  return Number.isInteger(n) && n >= 2 && (n & (n - 1)) === 0;
}

/** Smallest power of two ≥ n (and ≥ 2). */
export function nextPowerOfTwo(n: number): number {
  if (!(n >= 1) || !Number.isFinite(n)) throw new RangeError(`nextPowerOfTwo: need a finite n ≥ 1, got ${n}`);
  let m = 2;
  while (m < n) m *= 2;
  return m;
}

function transformFor(size: number): FFT {
  let fft = cache.get(size);
  if (fft === undefined) {
    fft = new FFT(size);
    cache.set(size, fft);
  }
  return fft;
}

/** One-sided spectrum of a real record: bins 0…size/2, read through accessors. */
export class HalfSpectrum {
  /** Transform length M (a power of two). */
  readonly size: number;
  /** Number of bins, M/2 + 1. */
  readonly bins: number;
  readonly #data: Float64Array;

  constructor(size: number, interleaved: Float64Array) {
    this.size = size;
    this.bins = size / 2 + 1;
    this.#data = interleaved;
  }

  re(k: number): number {
    return this.#data[2 * k];
  }

  im(k: number): number {
    return this.#data[2 * k + 1];
  }

  /** |X[k]|². */
  power(k: number): number {
    const r = this.#data[2 * k];
    const i = this.#data[2 * k + 1];
    return r * r + i * i;
  }

  magnitude(k: number): number {
    return Math.sqrt(this.power(k));
  }

  phase(k: number): number {
    return Math.atan2(this.#data[2 * k + 1], this.#data[2 * k]);
  }
}

/** DFT of a real record whose length is a power of two (caller's duty: pad first). */
export function realSpectrum(input: Float64Array): HalfSpectrum {
  const size = input.length;
  if (!isPowerOfTwo(size)) throw new RangeError(`realSpectrum: length must be a power of two ≥ 2, got ${size}`);
  const out = new Float64Array(2 * size);
  transformFor(size).realTransform(out, input);
  return new HalfSpectrum(size, out);
}
