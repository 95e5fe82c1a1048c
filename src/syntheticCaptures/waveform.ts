/**
 * Seeded waveform synthesizer for tests, the demo and the benchmark.
 *
 * Shapes follow their textbook definitions (peak amplitude A, zero mean before offset):
 * - triangle with rise fraction r: rises from −A to +A over r·T, falls over (1 − r)·T;
 * - square/pulse: high for duty·T from the phase origin, then low (square is ±A; pulse 0…2A shifted by
 *   the offset, so `amplitude` is always half the step);
 * - sawtooth: rises from −A to +A over the whole period, instant reset (series 2A/(πn)·(−1)^(n+1));
 * - sine with optional harmonics given as fractions of the fundamental.
 * Edges of square and pulse can be shaped by a first-order RC (v = 1 − e^(−t/τ)) or a second-order
 * underdamped step (1 − e^(−ζωt)(cos ω_d t + ζ/√(1−ζ²) sin ω_d t), Ogata, Modern Control Engineering §5-3),
 * computed exactly at each sample by superposing the step responses of the recent edges.
 * `bandLimited` sums the Fourier series up to Nyquist instead (for harmonic tests on ideal shapes).
 */
import { createRandom } from './random.js';

export type SynthShape = 'sine' | 'triangle' | 'square' | 'pulse' | 'sawtooth';

export interface EdgeShape {
  /** First-order time constant τ = RC, seconds. */
  readonly tau?: number;
  /** Second-order step: damping ratio ζ (0 < ζ < 1) and natural frequency ωn (rad/s). */
  readonly zeta?: number;
  readonly omegaN?: number;
}

export interface SynthSpec {
  readonly shape: SynthShape;
  readonly frequency: number;
  /** Peak amplitude (half of peak-to-peak). */
  readonly amplitude: number;
  readonly sampleRate: number;
  readonly samples: number;
  readonly offset?: number;
  /** Phase at t = 0 in cycles (0…1). */
  readonly phase?: number;
  /** Triangle: rising share of the period (0.5 symmetric). */
  readonly riseFraction?: number;
  /** Square/pulse: high share of the period (0.5 for square). */
  readonly duty?: number;
  readonly edge?: EdgeShape;
  /** Sine only: extra harmonics as fractions of the fundamental's amplitude. */
  readonly harmonics?: readonly { readonly n: number; readonly fraction: number; readonly phase?: number }[];
  /** Sum the ideal Fourier series up to Nyquist (square, triangle, sawtooth, pulse). */
  readonly bandLimited?: boolean;
  /** Additive white Gaussian noise, rms volts. */
  readonly noise?: number;
  /** Additive mains hum components. */
  readonly hum?: readonly { readonly frequency: number; readonly amplitude: number; readonly phase?: number }[];
  /** Quantise to this many bits over fullScale (mid-tread). */
  readonly bits?: number;
  /** Full-scale span in volts for quantisation, centred on 0 (default: 2·(|offset| + amplitude)·1.1). */
  readonly fullScale?: number;
  /** Clamp to these limits (a trace run off the screen or a rail). */
  readonly clip?: { readonly low: number; readonly high: number };
  /** Start time of the first sample, seconds. */
  readonly startTime?: number;
  readonly seed?: number;
}

export interface SynthSignal {
  readonly t0: number;
  readonly dt: number;
  readonly values: Float64Array;
}

export function synthesize(spec: SynthSpec): SynthSignal {
  const { sampleRate, samples, offset = 0, startTime = 0, seed = 1 } = spec;
  if (!(sampleRate > 0) || !Number.isInteger(samples) || samples < 1) {
    throw new RangeError(`synthesize: bad sampleRate ${sampleRate} or samples ${samples}`);
  }
  const dt = 1 / sampleRate;
  const values = new Float64Array(samples);
  const shapeAt = makeShapeFunction(spec);
  for (let i = 0; i < samples; i++) values[i] = shapeAt(startTime + i * dt) + offset;
  addImpairments(values, spec, dt, startTime, createRandom(seed));
  return { t0: startTime, dt, values };
}

function makeShapeFunction(spec: SynthSpec): (t: number) => number {
  const { shape, frequency: f, amplitude: A, phase = 0 } = spec;
  const cyc = (t: number): number => {
    const p = t * f + phase;
    return p - Math.floor(p);
  };
  if (spec.bandLimited && shape !== 'sine') return bandLimited(spec);
  switch (shape) {
    case 'sine':
      return (t) => {
        const w = 2 * Math.PI * (t * f + phase);
        let v = A * Math.sin(w);
        for (const h of spec.harmonics ?? []) v += A * h.fraction * Math.sin(h.n * w + (h.phase ?? 0));
        return v;
      };
    case 'triangle': {
      const r = spec.riseFraction ?? 0.5;
      return (t) => {
        const p = cyc(t);
        return p < r ? -A + (2 * A * p) / r : A - (2 * A * (p - r)) / (1 - r);
      };
    }
    case 'sawtooth':
      return (t) => -A + 2 * A * cyc(t);
    case 'square':
    case 'pulse': {
      const duty = spec.duty ?? 0.5;
      const base = shape === 'pulse' ? A : 0;
      if (spec.edge && (spec.edge.tau || spec.edge.zeta)) return shapedPulse(spec, duty, base);
      return (t) => base + (cyc(t) < duty ? A : -A);
    }
  }
}

/** Fourier series summed to Nyquist: square/pulse c_n = (2·step/(πn))·sin(nπD), triangle, sawtooth. */
function bandLimited(spec: SynthSpec): (t: number) => number {
  const { shape, frequency: f, amplitude: A, phase = 0, sampleRate } = spec;
  const nMax = Math.floor((sampleRate / 2 - 1e-9) / f);
  const duty = spec.duty ?? 0.5;
  const r = spec.riseFraction ?? 0.5;
  return (t) => {
    const w = 2 * Math.PI * (t * f + phase);
    // Mean level: a pulse sits on A (levels 0…2A), a square on 0 (levels ±A); both shift with duty.
    let v = shape === 'triangle' || shape === 'sawtooth' ? 0 : (shape === 'pulse' ? A : 0) + 2 * A * (duty - 0.5);
    for (let n = 1; n <= nMax; n++) {
      if (shape === 'sawtooth') v -= ((2 * A) / (Math.PI * n)) * Math.sin(n * w);
      else if (shape === 'triangle') v += triangleTerm(n, A, r, w);
      else {
        // Rectangular wave high for D·T from phase 0: a_n, b_n of a pulse of height 2A.
        const k = (4 * A) / (Math.PI * n);
        v += (k / 2) * (Math.sin(n * w) - Math.sin(n * (w - 2 * Math.PI * duty)));
      }
    }
    return v;
  };
}

/** Series term of the asymmetric triangle (rise share r), derived by integrating the ramps. */
function triangleTerm(n: number, A: number, r: number, w: number): number {
  // x(θ) on θ∈[0,2π): rises −A→A over [0, 2πr], falls back over [2πr, 2π). Its derivative is a
  // rectangular wave of levels 2A/(2πr) and −2A/(2π(1−r)); integrating that wave's series gives
  // x = Σ c_n·sin(nθ − nπr) with c_n = (2A/(π²n²r(1−r)))·sin(nπr); for r = ½ this is the familiar
  // −(8A/π²)·Σ cos(nθ)/n² over odd n, which starts the ramp at −A.
  const c = ((2 * A) / (Math.PI * Math.PI * n * n * r * (1 - r))) * Math.sin(n * Math.PI * r);
  return c * Math.sin(n * w - n * Math.PI * r);
}

function shapedPulse(spec: SynthSpec, duty: number, base: number): (t: number) => number {
  const { frequency: f, amplitude: A, phase = 0, edge = {} } = spec;
  const T = 1 / f;
  const step = stepResponse(edge);
  const settle = edge.tau ? 40 * edge.tau : 40 / ((edge.zeta ?? 1) * (edge.omegaN ?? 1));
  const back = Math.ceil(settle / T) + 1;
  return (t) => {
    const p = t * f + phase;
    const k = Math.floor(p);
    let v = base - A; // level long ago is low; add every recent edge's step response
    // Edges: rising at cycle starts (p = k), falling at p = k + duty.
    for (let j = k - back; j <= k; j++) {
      const tr = (j - phase) * T;
      const tf = (j + duty - phase) * T;
      if (t >= tr) v += 2 * A * step(t - tr);
      if (t >= tf) v -= 2 * A * step(t - tf);
    }
    // Edges before the window have settled: whole rising/falling pairs cancel.
    return v;
  };
}

function stepResponse(edge: EdgeShape): (t: number) => number {
  if (edge.zeta !== undefined && edge.omegaN !== undefined) {
    const { zeta: z, omegaN: wn } = edge;
    const wd = wn * Math.sqrt(1 - z * z);
    const k = z / Math.sqrt(1 - z * z);
    return (t) => 1 - Math.exp(-z * wn * t) * (Math.cos(wd * t) + k * Math.sin(wd * t));
  }
  const tau = edge.tau ?? 0;
  return (t) => (tau > 0 ? 1 - Math.exp(-t / tau) : 1);
}

function addImpairments(
  values: Float64Array,
  spec: SynthSpec,
  dt: number,
  t0: number,
  rnd: ReturnType<typeof createRandom>,
): void {
  const { noise = 0, hum = [], bits, clip } = spec;
  for (let i = 0; i < values.length; i++) {
    const t = t0 + i * dt;
    let v = values[i];
    for (const h of hum) v += h.amplitude * Math.sin(2 * Math.PI * h.frequency * t + (h.phase ?? 0));
    if (noise > 0) v += noise * rnd.gaussian();
    values[i] = v;
  }
  if (bits !== undefined) {
    const fs = spec.fullScale ?? 2.2 * (Math.abs(spec.offset ?? 0) + spec.amplitude);
    const q = fs / 2 ** bits;
    const top = fs / 2 - q;
    for (let i = 0; i < values.length; i++) {
      values[i] = Math.min(top, Math.max(-fs / 2, Math.round(values[i] / q) * q));
    }
  }
  if (clip) {
    for (let i = 0; i < values.length; i++) values[i] = Math.min(clip.high, Math.max(clip.low, values[i]));
  }
}
