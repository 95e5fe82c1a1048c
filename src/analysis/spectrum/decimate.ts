/**
 * Integer-factor decimation through four cascaded length-D moving averages (the impulse response
 * of a 4th-order cascaded integrator-comb decimator: E. B. Hogenauer, "An economical class of
 * digital filters for decimation and interpolation", IEEE Trans. ASSP 29(2), 1981), computed as
 * a direct FIR on the kept outputs only. Its magnitude response is known in closed form,
 * |H(f)| = |sin(πfD/f_s) / (D·sin(πf/f_s))|⁴, so levels read after it are corrected exactly; it
 * has nulls on every multiple of the new sample rate, where aliases would fold onto DC.
 */
export interface Decimated {
  readonly values: Float64Array;
  readonly sampleRate: number;
  /** Magnitude response at f (Hz, input rate), for correcting levels read after decimation. */
  readonly response: (f: number) => number;
}

const ORDER = 4;

/**
 * The 4-fold convolution of a length-D box, divided by D⁴. Each stage is a running sum over the
 * previous one (O(length), where convolving term by term would cost O(D²) per stage: seconds at
 * the factors of 10^4 that long records need). The sums are integers below D³, exact in binary64
 * for any factor up to 2·10^5, so only the final division rounds.
 */
function movingAverageKernel(factor: number): Float64Array {
  let h = new Float64Array([1]);
  for (let stage = 0; stage < ORDER; stage++) {
    const next = new Float64Array(h.length + factor - 1);
    let window = 0;
    for (let i = 0; i < next.length; i++) {
      if (i < h.length) window += h[i];
      if (i >= factor) window -= h[i - factor];
      next[i] = window;
    }
    h = next;
  }
  const scale = factor ** ORDER;
  for (let i = 0; i < h.length; i++) h[i] /= scale;
  return h;
}

export function decimate(samples: Float64Array, sampleRate: number, factor: number): Decimated {
  if (!Number.isInteger(factor) || factor < 1) throw new RangeError(`decimate: factor must be a positive integer, got ${factor}`);
  const h = movingAverageKernel(factor);
  const count = Math.floor((samples.length - h.length) / factor) + 1;
  if (count < 1) throw new RangeError(`decimate: ${samples.length} samples are too few for factor ${factor}`);
  const values = new Float64Array(count);
  for (let j = 0; j < count; j++) {
    const base = j * factor;
    let acc = 0;
    for (let k = 0; k < h.length; k++) acc += h[k] * samples[base + k];
    values[j] = acc;
  }
  const response = (f: number): number => {
    const x = (Math.PI * f) / sampleRate;
    const s = Math.sin(x);
    return Math.abs(s) < 1e-15 ? 1 : Math.abs(Math.sin(factor * x) / (factor * s)) ** ORDER;
  };
  return { values, sampleRate: sampleRate / factor, response };
}
