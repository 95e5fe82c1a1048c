/**
 * Frequency-domain measurements of one channel: harmonic table, THD, SNR, SINAD, ENOB, SFDR,
 * shape error, even/odd balance, mains hum and a plot-ready spectrum.
 *
 * Methods: F. J. Harris, Proc. IEEE 66(1), 1978 (windows); IEEE Std 1057 / 1241 (multi-harmonic
 * least-squares fit, SINAD, ENOB, SFDR); each file names its own source. One span of at most
 * 2^20 samples is transformed (a 2^22-point transform needs 32 MB of fresh memory and some 0.3 s
 * on the bench machine, see DEVELOPERS.md, Performance); longer records are also decimated whole
 * for the hum search, which needs the full duration rather than the full bandwidth.
 */
import type { Harmonic, MeasureResult, MeasurementId, Shape, SpectrumPlot } from '../../types/index.js';
import { decimate } from './decimate.js';
import { enob, sinad } from './sinad.js';
import { evenOddRatio } from './evenOddRatio.js';
import { analyseHarmonics, type HarmonicAnalysis, type HarmonicSet, type Withheld } from './harmonicAnalysis.js';
import { harmonics } from './harmonics.js';
import { hum, type HumComponent } from './hum.js';
import { idealSeries } from './idealSeries.js';
import { sfdr } from './sfdr.js';
import { shapeError } from './shapeError.js';
import { snr } from './snr.js';
import { buildFrame, frameBufferLength, type SpectralFrame } from './spectralFrame.js';
import { spectrumPlot } from '../plots/spectrumPlot.js';
import { thd } from './thd.js';

export interface SpectralOptions {
  /** Highest harmonic listed in the table (default 50, fewer when Nyquist comes first). */
  readonly maxHarmonic?: number;
  /** Harmonics the sums take (THD, shape error, even/odd): every one below Nyquist unless a count or bandwidth is given. */
  readonly harmonicSet?: HarmonicSet;
  /** Build the decimated spectrum for plots. */
  readonly plot?: boolean;
  /** The channel is clipped: THD and harmonic levels are withheld. */
  readonly clipped?: boolean;
  /** Pulse only: measured duty cycle in percent, for the ideal series (else estimated from A₂/A₁). */
  readonly dutyCycle?: number;
  /**
   * Working memory for the transform, reused between channels (spectralBufferLength values at
   * least); overwritten. Without it each call allocates its own.
   */
  readonly buffer?: Float64Array;
}

export interface SpectralResult {
  /** thd, snr, sinad, sfdr, enob, humFrequency, humLevel, shapeError, evenOddRatio (those that apply). */
  readonly measurements: Partial<Record<MeasurementId, MeasureResult>>;
  readonly harmonics: readonly Harmonic[];
  readonly harmonicsMethod: string;
  readonly spectrum?: SpectrumPlot;
  /** Hum components found (absent when none rose above the noise). */
  readonly hum?: { readonly mains: 50 | 60; readonly components: readonly HumComponent[] };
}

/** Longest span transformed at once (2^20 samples). */
export const MAX_SPAN = 2 ** 20;

/** Values the `buffer` option must hold for a record of `samples` samples. */
export function spectralBufferLength(samples: number): number {
  return frameBufferLength(Math.max(1, Math.min(samples, MAX_SPAN)));
}
const MIN_SAMPLES = 64;
/** Sample rate the whole record is decimated to for the hum search when it is too long to transform at once. */
const HUM_RATE = 4000;
const WINDOW = 'blackman-harris-4';
const HARMONIC_IDS = ['thd', 'snr', 'sinad', 'enob', 'sfdr', 'shapeError', 'evenOddRatio'] as const;

type Measurements = Partial<Record<MeasurementId, MeasureResult>>;

/**
 * Frequency-domain measurements of one channel. `fundamental` comes from the time-domain frequency
 * measurement; null when it was withheld (then only hum and the plot are attempted).
 */
export function analyzeSpectrum(
  samples: Float64Array,
  dt: number,
  fundamental: number | null,
  shape: Shape,
  options: SpectralOptions = {},
): SpectralResult {
  const { maxHarmonic = 50, harmonicSet = {}, plot = false, clipped = false, dutyCycle, buffer } = options;
  if (!(dt > 0) || !Number.isFinite(dt)) throw new RangeError(`analyzeSpectrum: dt must be a positive finite number, got ${dt}`);
  if (!Number.isInteger(maxHarmonic) || maxHarmonic < 1) throw new RangeError(`analyzeSpectrum: maxHarmonic must be an integer ≥ 1, got ${maxHarmonic}`);
  const unusable = checkSamples(samples);
  if (unusable !== null) return withheldAll(unusable, shape);
  const fs = 1 / dt;
  const frame = buildFrame(samples.subarray(0, Math.min(samples.length, MAX_SPAN)), fs, WINDOW, undefined, buffer);
  const measurements: Measurements = {};
  const { table, method, reference } = measureAtFundamental(measurements, frame, fundamental, shape, { maxHarmonic, harmonicSet }, clipped, dutyCycle);
  const humResult = measureHum(measurements, samples, fs, frame, fundamental, reference);
  const spectrum = !plot
    ? undefined
    : reference === null
      ? spectrumPlot(frame, fundamental, largestComponent(frame), 'largest component')
      : spectrumPlot(frame, fundamental, reference);
  return {
    measurements,
    harmonics: table,
    harmonicsMethod: method,
    ...(spectrum ? { spectrum } : {}),
    ...(humResult ? { hum: humResult } : {}),
  };
}

/** The harmonic set, or its withheld reasons; returns the table, its method and the fundamental's amplitude. */
function measureAtFundamental(
  m: Measurements,
  frame: SpectralFrame,
  fundamental: number | null,
  shape: Shape,
  set: { readonly maxHarmonic: number; readonly harmonicSet: HarmonicSet },
  clipped: boolean,
  dutyCycle: number | undefined,
): { table: Harmonic[]; method: string; reference: number | null } {
  const h: HarmonicAnalysis | Withheld =
    fundamental === null
      ? { ok: false, reason: 'too-few-cycles', detail: 'the fundamental frequency was not measured; harmonic analysis needs it' }
      : analyseHarmonics(frame, fundamental, set.maxHarmonic, set.harmonicSet);
  if ('ok' in h) {
    withholdHarmonicSet(m, h, shape);
    return { table: [], method: `not measured: ${h.detail}`, reference: null };
  }
  if (clipped) {
    withholdClipped(m, h, shape);
    return { table: [], method: `withheld: the channel is clipped, so harmonic levels describe the clipping (${h.method})`, reference: h.fit.amplitude[1] };
  }
  return { table: measureHarmonics(m, h, shape, dutyCycle), method: h.method, reference: h.fit.amplitude[1] };
}

function checkSamples(samples: Float64Array): Withheld | null {
  if (samples.length < MIN_SAMPLES) {
    return { ok: false, reason: 'too-few-samples', detail: `${samples.length} samples; spectral analysis needs at least ${MIN_SAMPLES}` };
  }
  for (let i = 0; i < samples.length; i++) {
    if (!Number.isFinite(samples[i])) return { ok: false, reason: 'invalid-samples', detail: `sample ${i} is ${samples[i]}` };
  }
  return null;
}

function withheldAll(why: Withheld, shape: Shape): SpectralResult {
  const measurements: Measurements = { humFrequency: why, humLevel: why };
  withholdHarmonicSet(measurements, why, shape);
  return { measurements, harmonics: [], harmonicsMethod: `not measured: ${why.detail}` };
}

function withholdHarmonicSet(m: Measurements, why: Withheld, shape: Shape): void {
  for (const id of HARMONIC_IDS) if (applies(id, shape)) m[id] = why;
}

/** SINAD and ENOB count harmonics as distortion, so they apply to a sine; shape error needs an ideal series. */
function applies(id: (typeof HARMONIC_IDS)[number], shape: Shape): boolean {
  if (id === 'sinad' || id === 'enob') return shape === 'sine';
  if (id === 'shapeError') return shape !== 'unknown';
  return true;
}

function measureHarmonics(m: Measurements, h: HarmonicAnalysis, shape: Shape, dutyCycle: number | undefined): Harmonic[] {
  const { ideal, note } = idealFor(h, shape, dutyCycle);
  m.thd = thd(h);
  m.snr = snr(h, shape);
  if (shape === 'sine') {
    m.sinad = sinad(h, shape);
    m.enob = enob(m.sinad);
  }
  m.sfdr = sfdr(h);
  if (shape !== 'unknown') m.shapeError = shapeError(h, shape, ideal, note);
  m.evenOddRatio = evenOddRatio(h);
  return harmonics(h, ideal);
}

function withholdClipped(m: Measurements, h: HarmonicAnalysis, shape: Shape): void {
  const why: Withheld = { ok: false, reason: 'clipped', detail: 'the channel is clipped; its harmonic levels describe the clipping, not the oscillator' };
  withholdHarmonicSet(m, why, shape);
  m.snr = snr(h, shape);
}

/** Ideal series for the shape; a pulse takes its duty from the caller or from cos(πD) = A₂/A₁. */
function idealFor(h: HarmonicAnalysis, shape: Shape, dutyCycle: number | undefined): { ideal: Float64Array | null; note: string } {
  if (shape !== 'pulse') return { ideal: idealSeries(shape, h.reported), note: '' };
  if (dutyCycle !== undefined && dutyCycle > 0 && dutyCycle < 100) {
    return { ideal: idealSeries(shape, h.reported, dutyCycle / 100), note: `duty ${dutyCycle.toFixed(1)} % as measured` };
  }
  if (h.reported < 2) return { ideal: null, note: 'the duty cycle is unknown and the 2nd harmonic is above Nyquist' };
  const duty = Math.acos(Math.min(1, h.fit.amplitude[2] / h.fit.amplitude[1])) / Math.PI;
  return { ideal: idealSeries(shape, h.reported, duty), note: `duty ${(100 * duty).toFixed(1)} % (or its complement) from cos(πD) = A₂/A₁` };
}

function measureHum(
  m: Measurements,
  samples: Float64Array,
  fs: number,
  frame: SpectralFrame,
  fundamental: number | null,
  reference: number | null,
): SpectralResult['hum'] {
  let humFrame = frame;
  if (samples.length > MAX_SPAN) {
    // Hum needs the whole duration but only the band below a few hundred hertz; harmonics of the
    // fundamental that fold into it are skipped by hum.ts, so decimating hard is safe.
    const factor = Math.max(Math.ceil(samples.length / MAX_SPAN), Math.floor(fs / HUM_RATE));
    const d = decimate(samples, fs, factor);
    humFrame = buildFrame(d.values, d.sampleRate, WINDOW, d.response);
  }
  const found = hum(humFrame, fundamental, fs, reference);
  if (found === null) return undefined;
  if ('withheld' in found) {
    m.humFrequency = found.withheld;
    m.humLevel = found.withheld;
    return undefined;
  }
  if ('bound' in found) {
    m.humFrequency = { ok: false, reason: 'below-noise', detail: found.bound.detail };
    m.humLevel = found.bound;
    return undefined;
  }
  m.humFrequency = found.humFrequency;
  m.humLevel = found.humLevel;
  return { mains: found.mains, components: found.components };
}

/** Amplitude of the strongest bin outside the DC lobe, the plot's reference when no fundamental is known. */
function largestComponent(frame: SpectralFrame): number {
  let peak = 0;
  for (let k = Math.ceil(frame.lobeBins); k < frame.spectrum.bins; k++) peak = Math.max(peak, frame.spectrum.magnitude(k));
  return (2 * peak) / frame.s1;
}
