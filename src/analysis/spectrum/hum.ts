/**
 * Mains hum: the strongest of the 50 Hz and 60 Hz families (mains and its 2nd harmonic, the
 * full-wave rectifier ripple), read apart from the oscillator's own harmonics.
 *
 * - Search bands follow EN 50160 §4.2.1 (47–52 Hz for a 50 Hz system, the same −6 %/+4 % for
 *   60 Hz) and twice those for the ripple; mains frequencies from IEC 60038 Table 1.
 * - Bins within two main lobes of any harmonic of the fundamental (folded into the band when the
 *   record was decimated, unless the decimation filter holds it below −140 dB) are skipped, so a
 *   harmonic is never reported as hum.
 * - A peak counts when its bin holds at least 20 times the local mean noise power (13 dB): for
 *   noise alone, |X|² is exponential and exceeds that with odds e^(−20) per bin. The local mean is
 *   the median of the clean bins from 20 to 300 Hz over ln 2 (median of an exponential law).
 * - Its frequency comes from a Gaussian interpolation of the peak and neighbours; its amplitude
 *   from a least-squares fit of one tone there (harmonicFit.ts), so there is no scallop loss.
 * The level is the rss of the family's components over the fundamental, in dBc.
 * Nothing found: an upper bound instead of a value. A tone of peak A that lies δ DFT bins off a bin
 * centre reads |X| = A·|W(δ)|/2 (Heinzel et al. 2002, §9), least at δ = ½, and noise of mean power
 * N per bin moves that bin by more than 2√N with odds e⁻⁴ (Rayleigh law); so a tone anywhere in a
 * search band is at most 2·(largest |X| there + 2√N)/|W(½)| (common practice, no source), and the
 * family's level at most the rss of its two bands' bounds. Where a harmonic of the fundamental covers
 * a mains frequency the bound would not hold, and hum is withheld.
 */
import type { MeasureResult } from '../../types/index.js';
import { fitHarmonics } from './harmonicFit.js';
import { bounded } from '../measureResult.js';
import { frameKernel, type SpectralFrame } from './spectralFrame.js';

export interface HumComponent {
  readonly frequency: number;
  readonly amplitude: number;
  /** 1 for the mains frequency, 2 for its 2nd harmonic (ripple). */
  readonly order: 1 | 2;
}

export interface HumFinding {
  readonly mains: 50 | 60;
  readonly components: readonly HumComponent[];
  readonly humFrequency: MeasureResult;
  readonly humLevel: MeasureResult;
}

/** Nothing stood out: the hum level is below a bound (absent without a fundamental to refer it to). */
export interface HumBound {
  readonly bound: MeasureResult & { ok: false };
}

export type HumOutcome = HumFinding | HumBound | { readonly withheld: MeasureResult & { ok: false } } | null;

/** Shortest span that resolves 50 Hz from 60 Hz with the 4-term Blackman-Harris main lobe (±4/T). */
export const MIN_HUM_SPAN = 0.4;
const DETECT = 20;
/** Folded harmonics the decimation filter attenuates below −140 dB cannot pose as hum. */
const MIN_FOLDED_RESPONSE = 1e-7;
const NOISE_BAND: readonly [number, number] = [20, 300];

export function hum(frame: SpectralFrame, fundamental: number | null, sourceRate: number, reference: number | null): HumOutcome {
  const span = frame.length / frame.sampleRate;
  if (span < MIN_HUM_SPAN) {
    return { withheld: { ok: false, reason: 'too-few-cycles', detail: `the record spans ${span.toPrecision(3)} s; telling 50 Hz from 60 Hz hum needs at least ${MIN_HUM_SPAN} s` } };
  }
  if (frame.sampleRate / 2 <= 130) {
    return { withheld: { ok: false, reason: 'aliasing', detail: `sampling at ${frame.sampleRate} Hz cannot show 100/120 Hz ripple` } };
  }
  const blocked = blockedBins(frame, fundamental, sourceRate);
  const noise = localNoise(frame, blocked);
  if (noise === null) return null;
  const families = ([50, 60] as const).map((mains) => findFamily(frame, blocked, noise, mains));
  const best = families.reduce((a, b) => (rss(b.components) > rss(a.components) ? b : a));
  if (best.components.length === 0) return noneFound(frame, blocked, noise, reference);
  return describe(best.mains, best.components, reference);
}

const MAINS_LINES = [50, 60, 100, 120] as const;

function noneFound(frame: SpectralFrame, blocked: Uint8Array, noise: number, reference: number | null): HumOutcome {
  const covered = MAINS_LINES.filter((f) => blocked[Math.round(f / frame.binWidth)] === 1);
  if (covered.length > 0) {
    const why = `no hum stands out, but harmonics of the fundamental cover ${covered.join(', ')} Hz, where hum could hide; capture at a frequency whose harmonics miss the mains lines to bound it`;
    return { withheld: { ok: false, reason: 'not-applicable', detail: why } };
  }
  if (reference === null || !(reference > 0)) return null;
  const edge = Math.hypot(frameKernel(frame, 0.5).re, frameKernel(frame, 0.5).im);
  // Largest amplitude a component in a search band can have: its peak bin reads at least
  // A·|W(½)|/2, and that bin holds at most the band's largest magnitude plus 2σ of the noise in it.
  const largest = (mains: number, order: number): number => {
    const k0 = Math.ceil((order * mains * 0.94) / frame.binWidth);
    const k1 = Math.min(blocked.length - 1, Math.floor((order * mains * 1.04) / frame.binWidth));
    let m = 0;
    for (let k = k0; k <= k1; k++) if (!blocked[k]) m = Math.max(m, frame.spectrum.magnitude(k));
    return (2 * (m + 2 * Math.sqrt(noise))) / (edge * frame.response(order * mains));
  };
  const families = ([50, 60] as const).map((mains) => ({ mains, parts: [largest(mains, 1), largest(mains, 2)] }));
  const worst = families.reduce((a, b) => (Math.hypot(...b.parts) > Math.hypot(...a.parts) ? b : a));
  const dbc = (a: number): string => (20 * Math.log10(a / reference)).toFixed(1);
  const level = 20 * Math.log10(Math.hypot(...worst.parts) / reference);
  const detail = `no 50/60 Hz mains component or 100/120 Hz ripple stands above the noise (a component would show from ${dbc(2 * (Math.sqrt(DETECT) + 2) * Math.sqrt(noise) / edge)} dBc)`;
  const method = `upper bound: the largest bin in each mains search band, plus 2σ of the noise, read at the least favourable bin offset; the ${worst.mains} Hz family's rss is then below ${level.toFixed(1)} dBc (${worst.mains} Hz under ${dbc(worst.parts[0])} dBc, ${2 * worst.mains} Hz under ${dbc(worst.parts[1])} dBc)`;
  return { bound: bounded('upper', level, detail, method) as MeasureResult & { ok: false } };
}

function rss(c: readonly HumComponent[]): number {
  return Math.sqrt(c.reduce((s, x) => s + x.amplitude ** 2, 0));
}

/** Marks the DC lobe and two main lobes around every harmonic of the fundamental (folded into the frame's band). */
function blockedBins(frame: SpectralFrame, fundamental: number | null, sourceRate: number): Uint8Array {
  const bins = Math.min(frame.spectrum.bins, Math.ceil((NOISE_BAND[1] + 10) / frame.binWidth));
  const blocked = new Uint8Array(bins);
  const mark = (centre: number): void => {
    const lo = Math.max(0, Math.ceil(centre - 2 * frame.lobeBins));
    const hi = Math.min(bins - 1, Math.floor(centre + 2 * frame.lobeBins));
    for (let k = lo; k <= hi; k++) blocked[k] = 1;
  };
  mark(0);
  if (fundamental !== null) {
    for (let n = 1; n * fundamental < sourceRate / 2; n++) {
      const f = n * fundamental;
      // After decimation a harmonic folds into the band only as strongly as the filter passes it.
      if (frame.response(f) < MIN_FOLDED_RESPONSE) continue;
      const folded = Math.abs(f - frame.sampleRate * Math.round(f / frame.sampleRate));
      if (folded <= NOISE_BAND[1] + 10 + 2 * frame.lobeBins * frame.binWidth) mark(folded / frame.binWidth);
    }
  }
  return blocked;
}

function localNoise(frame: SpectralFrame, blocked: Uint8Array): number | null {
  const values: number[] = [];
  const lo = Math.ceil(NOISE_BAND[0] / frame.binWidth);
  const hi = Math.min(blocked.length - 1, Math.floor(NOISE_BAND[1] / frame.binWidth));
  for (let k = lo; k <= hi; k++) if (!blocked[k]) values.push(frame.spectrum.power(k));
  if (values.length < 16) return null;
  values.sort((a, b) => a - b);
  return values[Math.floor(values.length / 2)] / Math.LN2;
}

function findFamily(frame: SpectralFrame, blocked: Uint8Array, noise: number, mains: 50 | 60): { mains: 50 | 60; components: HumComponent[] } {
  const components: HumComponent[] = [];
  for (const order of [1, 2] as const) {
    const k = peakBin(frame, blocked, order * mains * 0.94, order * mains * 1.04);
    if (k === null || frame.spectrum.power(k) < DETECT * noise) continue;
    const frequency = interpolatePeak(frame, k) * frame.binWidth;
    const fit = fitHarmonics(frame, frequency, 1);
    if (fit !== null) components.push({ frequency, amplitude: fit.amplitude[1], order });
  }
  return { mains, components };
}

function peakBin(frame: SpectralFrame, blocked: Uint8Array, fLo: number, fHi: number): number | null {
  const s = frame.spectrum;
  let best: number | null = null;
  for (let k = Math.ceil(fLo / frame.binWidth); k <= Math.floor(fHi / frame.binWidth) && k < blocked.length - 1; k++) {
    if (blocked[k] || s.power(k) < s.power(k - 1) || s.power(k) < s.power(k + 1)) continue;
    if (best === null || s.power(k) > s.power(best)) best = k;
  }
  return best;
}

/** Vertex of the parabola through the log powers at k−1, k, k+1 (Gaussian peak interpolation). */
function interpolatePeak(frame: SpectralFrame, k: number): number {
  const s = frame.spectrum;
  const a = Math.log(s.power(k - 1));
  const b = Math.log(s.power(k));
  const c = Math.log(s.power(k + 1));
  const den = a - 2 * b + c;
  return den < 0 ? k + (0.5 * (a - c)) / den : k;
}

function describe(mains: 50 | 60, components: HumComponent[], reference: number | null): HumFinding {
  const level = rss(components);
  const fundamental = components.find((c) => c.order === 1);
  const frequency = fundamental ? fundamental.frequency : components[0].frequency / 2;
  const parts = components
    .map((c) => `${c.frequency.toFixed(1)} Hz${reference ? ` at ${(20 * Math.log10(c.amplitude / reference)).toFixed(1)} dBc` : ''}${c.order === 2 ? ' (2nd mains harmonic)' : ''}`)
    .join(', ');
  const method = `${mains} Hz mains family: ${parts}; peaks ≥ 13 dB over the local noise, away from harmonics of the fundamental`;
  const humLevel: MeasureResult =
    reference === null
      ? { ok: false, reason: 'too-few-cycles', detail: 'no fundamental was measured to refer the hum level to' }
      : { ok: true, value: 20 * Math.log10(level / reference), uncertainty: null, unit: 'dBc', method: `rss of the ${mains} Hz family over the fundamental: ${parts}` };
  return {
    mains,
    components,
    humFrequency: { ok: true, value: frequency, uncertainty: null, unit: 'Hz', method },
    humLevel,
  };
}
