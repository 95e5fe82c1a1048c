/**
 * Numeric edge cases through measureCapture: flat records, a lone spike, a channel of NaN,
 * denormal and 1e±30 magnitudes, two samples, femtosecond steps. Each gives finite values or values
 * withheld with a reason and a note — never NaN or Infinity — and the values it does give match the
 * closed forms of the signal: the mean and rms of a constant are the constant; a sine of peak A has
 * rms A/√2 (any circuits textbook, e.g. Horowitz & Hill, The Art of Electronics, 3rd ed., §1.7.1);
 * frequency and rms scale with the time base and the amplitude exactly (dimensional analysis).
 */
import { afterAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { measureCapture } from '../../src/analysis/index.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import type { SynthSignal } from '../../src/syntheticCaptures/index.js';
import type { ChannelReport, MeasureReport } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { captureOf } from '../analysis/captureOf.js';
import { newTally, saveTally, scaled, seedFor, timeBudget } from './budget.js';
import { reportProblems } from './fuzzTarget.js';

const tally = newTally();
afterAll(() => saveTally('numeric', tally));

const signal = (values: Float64Array, dt = 1e-5): SynthSignal => ({ t0: 0, dt, values });
const sine = (amplitude: number, dt = 1e-5, samples = 4096): SynthSignal =>
  synthesize({ shape: 'sine', frequency: 1 / (dt * 64.25), amplitude, sampleRate: 1 / dt, samples, seed: 3 });

function measured(signals: SynthSignal[]): MeasureReport {
  tally.inputs++;
  const r = measureCapture(captureOf(signals), { plotData: true });
  const problem = reportProblems(r);
  if (problem) {
    tally.crashes++;
    tally.notes.push(`numeric: ${problem}`);
  }
  expect(problem).toBeNull();
  return r;
}

const value = (ch: ChannelReport, id: keyof ChannelReport['measurements']): number | null => ch.measurements[id]?.value ?? null;
const reason = (ch: ChannelReport, id: keyof ChannelReport['measurements']): string | undefined => ch.measurements[id]?.reason;

describe('measureCapture on numeric edge cases', () => {
  it('withholds the frequency of a constant signal and gives its level as mean and rms', () => {
    const [ch] = measured([signal(new Float64Array(4096).fill(2.5))]).channels;
    expect(value(ch, 'frequency')).toBeNull();
    expect(reason(ch, 'frequency')).toMatch(/no-signal|too-few-cycles/);
    expectWithin(value(ch, 'dcOffset'), 2.5, { abs: 1e-12 }, 'closed form: the mean of a constant');
    expectWithin(value(ch, 'rms'), 2.5, { abs: 1e-12 }, 'closed form: the rms of a constant');
    expectWithin(value(ch, 'peakToPeak'), 0, { abs: 0 }, 'closed form: a constant has no swing');
  });

  it('withholds the frequency of a single spike and keeps its extremes', () => {
    const x = new Float64Array(4096);
    x[2000] = 1;
    const [ch] = measured([signal(x)]).channels;
    expect(value(ch, 'frequency')).toBeNull();
    expect(ch.measurements.frequency?.note).toBeTruthy();
    expectWithin(value(ch, 'maximum'), 1, { abs: 0 }, 'the spike as written');
    expectWithin(value(ch, 'minimum'), 0, { abs: 0 }, 'the baseline as written');
  });

  it('withholds every measurement of an all-NaN channel with invalid-samples and measures its neighbour', () => {
    const [bad, good] = measured([signal(new Float64Array(4096).fill(NaN)), sine(1)]).channels;
    const values = Object.values(bad.measurements);
    expect(values.length).toBeGreaterThan(0);
    for (const m of values) expect([m.value, m.reason]).toEqual([null, 'invalid-samples']);
    expectWithin(value(good, 'rms'), Math.SQRT1_2, { rel: 1e-3 }, 'closed form A/√2 (Horowitz & Hill §1.7.1)');
  });

  it('withholds everything on a two-sample record with too-few-samples', () => {
    const [ch] = measured([signal(Float64Array.of(0, 5))]).channels;
    for (const m of Object.values(ch.measurements)) expect([m.value, m.reason]).toEqual([null, 'too-few-samples']);
  });

  it('gives no timing to a denormal-amplitude sine and keeps its levels within 1e-300 V', () => {
    const [ch] = measured([sine(1e-310)]).channels;
    expect(value(ch, 'frequency')).toBeNull();
    expect(reason(ch, 'frequency')).toBe('no-signal');
    // Squares of denormals underflow to 0 in double precision (IEEE 754-2019 §7.5): the rms comes
    // out as 0, off by 7e-311 V — far below anything shown; stated here so a change is noticed.
    expectWithin(value(ch, 'rms'), 1e-310 * Math.SQRT1_2, { abs: 1e-300 }, 'closed form A/√2 (Horowitz & Hill §1.7.1)');
    expectWithin(value(ch, 'peakToPeak'), 2e-310, { rel: 1e-3 }, 'closed form 2A');
  });

  it('measures a sine at 1e-30 V and 1e+30 V as at 1 V, scaled exactly', () => {
    const [unit] = measured([sine(1)]).channels;
    for (const a of [1e-30, 1e30]) {
      const [ch] = measured([sine(a)]).channels;
      expectWithin(value(ch, 'frequency'), value(unit, 'frequency')!, { rel: 1e-9 }, 'frequency does not depend on amplitude');
      expectWithin(value(ch, 'rms'), a * Math.SQRT1_2, { rel: 1e-3 }, 'closed form A/√2 (Horowitz & Hill §1.7.1)');
      // An ideal sine's harmonics stay below their noise, so THD comes as an upper bound: a ratio too.
      const thd = (c: ChannelReport): number | null => value(c, 'thd') ?? c.measurements.thd?.bound?.value ?? null;
      expectWithin(thd(ch), thd(unit)!, { rel: 1e-6 }, 'THD is a ratio: independent of amplitude');
    }
  });

  it('gives a triangle at 1e-158 V finite values or bounds only (its harmonics’ squares underflow; a fuzzed case of the long run)', () => {
    const t = synthesize({ shape: 'triangle', frequency: 1 / 28.937150239738497, amplitude: 1e-158, sampleRate: 1, samples: 2151, seed: 5 });
    const values = Float64Array.from(t.values);
    values[823334214 % values.length] = NaN;
    const [ch] = measured([{ ...t, values }]).channels;
    // measured() has checked every number is finite; the balance is a value or withheld, never a crash.
    expect(ch.measurements.evenOddRatio).toBeDefined();
  });

  it('measures a sine sampled every 1e-15 s at 1e15/64.25 Hz', () => {
    const [ch] = measured([sine(1, 1e-15)]).channels;
    expectWithin(value(ch, 'frequency'), 1e15 / 64.25, { rel: 1e-6 }, 'closed form: 64.25 samples per period');
    expectWithin(value(ch, 'period'), 64.25e-15, { rel: 1e-6 }, 'closed form: 64.25 samples per period');
  });

  it('gives only finite or withheld values for any mix of scale, step, length, gaps and spikes', { timeout: scaled(60_000, 30 * 60_000) }, () => {
    const edgeCase = fc.record({
      shape: fc.constantFrom('sine', 'triangle', 'square', 'pulse', 'sawtooth') as fc.Arbitrary<'sine' | 'triangle' | 'square' | 'pulse' | 'sawtooth'>,
      // The reader stores values at or beyond 9.9e37 as NaN (SCPI overflow markers), so captures
      // never hold more; with the spike at 1000·A that leaves A up to 1e34.
      amplitudeExp: fc.integer({ min: -310, max: 34 }),
      dtExp: fc.integer({ min: -15, max: 0 }),
      samples: fc.oneof(fc.integer({ min: 2, max: 40 }), fc.integer({ min: 41, max: 6000 })),
      periodSamples: fc.double({ min: 1.5, max: 5000, noNaN: true }),
      nanAt: fc.array(fc.nat(), { maxLength: 5 }),
      spikeAt: fc.option(fc.nat()),
      offset: fc.constantFrom(0, 1, -1e3, 1e-300),
    });
    fc.assert(
      fc.property(edgeCase, (e) => {
        const dt = 10 ** e.dtExp;
        const a = 10 ** e.amplitudeExp;
        const s = synthesize({ shape: e.shape, frequency: 1 / (dt * e.periodSamples), amplitude: a, offset: e.offset * a, sampleRate: 1 / dt, samples: e.samples, seed: 5 });
        const values = Float64Array.from(s.values);
        for (const i of e.nanAt) values[i % values.length] = NaN;
        if (e.spikeAt !== null) values[e.spikeAt % values.length] = 1e3 * a;
        tally.inputs++;
        const problem = reportProblems(measureCapture(captureOf([{ ...s, values }]), { plotData: true }));
        if (problem) {
          tally.crashes++;
          tally.notes.push(`numeric: ${JSON.stringify(e)}: ${problem}`);
          throw new Error(problem);
        }
      }),
      { seed: seedFor(6), numRuns: scaled(60, 20_000), ...timeBudget(20 * 60_000) },
    );
  });
});
