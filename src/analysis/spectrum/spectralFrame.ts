/**
 * A windowed, zero-padded DFT of one span of a record, with what the fits need to read it: the
 * window sums (Heinzel, Rüdiger & Schilling 2002, §9: a tone of peak A at a bin centre reads
 * A·S1/2, white noise of variance σ² reads σ²·S2 per bin) and the main-lobe width in DFT bins.
 * The span's mean is removed first so a large offset does not leak into low harmonics.
 */
import { nextPowerOfTwo, spectrumInPlace, type HalfSpectrum } from './spectrum.js';
import { applyWindow, mainLobeHalfWidth, windowKernel, type Complex, type WindowKind } from './windows.js';

export interface SpectralFrame {
  readonly spectrum: HalfSpectrum;
  /** Sample rate of the analysed span, Hz. */
  readonly sampleRate: number;
  /** Samples in the span (window length L); the DFT length is spectrum.size ≥ L. */
  readonly length: number;
  readonly window: WindowKind;
  /** Σw and Σw². */
  readonly s1: number;
  readonly s2: number;
  /** Mean removed before windowing, and the variance of the span about it. */
  readonly mean: number;
  readonly variance: number;
  /** Main-lobe half-width in DFT bins. */
  readonly lobeBins: number;
  /** DFT bin spacing, Hz. */
  readonly binWidth: number;
  /** Magnitude response of any filter applied before the frame (1 when none), at f in Hz. */
  readonly response: (f: number) => number;
}

/**
 * No filter: one function for every frame, so that loops calling `frame.response` keep their
 * optimised code from one frame to the next (a fresh closure per frame is a new call target to V8).
 */
const FLAT_RESPONSE = (): number => 1;

/**
 * `buffer`, when given, is the transform's working memory (at least frameBufferLength(span.length)
 * values): the frame's spectrum then lives in it until the buffer is used again. Reusing one buffer
 * for every channel spares the fresh memory, which is slow to touch (shared/peer/MEASURED.md).
 */
export function buildFrame(
  span: Float64Array,
  sampleRate: number,
  window: WindowKind,
  response: (f: number) => number = FLAT_RESPONSE,
  buffer?: Float64Array,
): SpectralFrame {
  const length = span.length;
  const size = nextPowerOfTwo(length);
  if (buffer !== undefined && buffer.length < size + 2) throw new RangeError(`buildFrame: buffer holds ${buffer.length} values, a ${length}-sample span needs ${size + 2}`);
  let mean = 0;
  for (let i = 0; i < length; i++) mean += span[i];
  mean /= length;
  // The windowed span is written into the transform buffer and transformed in place: one large
  // array per frame, none when the caller lends one.
  const padded = buffer === undefined ? new Float64Array(size + 2) : buffer.subarray(0, size + 2).fill(0, length, size);
  const { s1, s2, squares: ss } = applyWindow(window, span, mean, padded);
  return {
    spectrum: spectrumInPlace(padded, size),
    sampleRate,
    length,
    window,
    s1,
    s2,
    mean,
    variance: ss / length,
    lobeBins: (mainLobeHalfWidth(window) * size) / length,
    binWidth: sampleRate / size,
    response,
  };
}

/** Values a transform buffer for a span of `length` samples must hold. */
export function frameBufferLength(length: number): number {
  return nextPowerOfTwo(length) + 2;
}

/** W at an offset of `bins` DFT bins from a component. */
export function frameKernel(frame: SpectralFrame, bins: number): Complex {
  return windowKernel(frame.window, frame.length, (2 * Math.PI * bins) / frame.spectrum.size);
}
