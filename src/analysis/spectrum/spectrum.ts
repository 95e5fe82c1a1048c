/**
 * The one front door to the FFT: a half spectrum of a real record, read by bin. No other file sees
 * the interleaved layout.
 *
 * Convention (checked in tests against a plain DFT and against fft.js): X[k] = Σ x[i]·e^(−2πik·i/M),
 * k = 0…M/2. The transform is our own kernel (realFft.ts), not fft.js: fft.js builds a full
 * twiddle table per size that cost more than the transforms themselves at the sizes a capture
 * needs (0.2 s at 2^20, 0.7 s at 2^22; DEVELOPERS.md, Performance), and wants 2·M doubles of
 * output. Ours keeps a quarter-wave cosine table per size and works in M + 2 doubles.
 */
import { realFftInPlace } from './realFft.js';

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
  const buffer = new Float64Array(size + 2);
  buffer.set(input);
  return spectrumInPlace(buffer, size);
}

/**
 * The same, transforming `buffer` in place: its first `size` values are the record (its length
 * must be size + 2); afterwards it belongs to the returned spectrum. Saves a copy of a long record.
 */
export function spectrumInPlace(buffer: Float64Array, size: number): HalfSpectrum {
  if (!isPowerOfTwo(size)) throw new RangeError(`spectrumInPlace: size must be a power of two ≥ 2, got ${size}`);
  if (buffer.length !== size + 2) throw new RangeError(`spectrumInPlace: buffer must hold size + 2 = ${size + 2} values, got ${buffer.length}`);
  realFftInPlace(buffer, size);
  return new HalfSpectrum(size, buffer);
}
