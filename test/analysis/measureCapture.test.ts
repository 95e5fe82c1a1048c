import { describe, expect, it } from 'vitest';
import { measureCapture } from '../../src/analysis/index.js';
import { MEASUREMENT_IDS, MEASUREMENT_UNITS } from '../../src/types/index.js';
import type { ChannelReport } from '../../src/types/index.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { captureOf, sameSamples } from './captureOf.js';

// Demo scenario (ours): FH-210 Kestrel VCO at `mid`, triangle ±3 V and pulse 0…10 V at 261.63 Hz.
const kestrel = { frequency: 261.63, sampleRate: 100_000, samples: 20_000, phase: 0.1 } as const;
const tri = () => synthesize({ ...kestrel, shape: 'triangle', amplitude: 3, noise: 0.004, seed: 1 });
const pulse = () => synthesize({ ...kestrel, shape: 'pulse', amplitude: 5, edge: { tau: 1e-6 }, noise: 0.004, seed: 2 });

function allNumbers(x: unknown, out: number[] = []): number[] {
  if (typeof x === 'number') out.push(x);
  else if (Array.isArray(x)) x.forEach((v) => allNumbers(v, out));
  else if (x && typeof x === 'object') Object.values(x).forEach((v) => allNumbers(v, out));
  return out;
}

describe('measureCapture', () => {
  it('measureCapture builds the schemaVersion 1 report for every channel', () => {
    const r = measureCapture(captureOf([tri(), pulse()], [{ name: 'triangle out' }, { name: 'pulse out' }]));
    expect(r.schemaVersion).toBe(1);
    expect(r.samples).toBe(20_000);
    expectWithin(r.duration, 0.2, { rel: 1e-12 }, '20 000 samples at 10 µs');
    expect(r.channels.map((c) => [c.name, c.shape])).toEqual([['triangle out', 'triangle'], ['pulse out', 'square']]);
    for (const ch of r.channels) {
      for (const [id, m] of Object.entries(ch.measurements)) {
        expect(MEASUREMENT_IDS as readonly string[], id).toContain(id);
        expect(m.unit, id).toBe(MEASUREMENT_UNITS[id as keyof typeof MEASUREMENT_UNITS]);
        if (m.value === null) expect(m.note, id).toBeTruthy();
        else expect(m.method, id).toBeTruthy();
      }
    }
  });

  it('measureCapture output survives a JSON round trip and holds no NaN or Infinity', () => {
    const r = measureCapture(captureOf([tri(), pulse()]), { plotData: true });
    const back = JSON.parse(JSON.stringify(r)) as typeof r;
    expect(back).toEqual(r);
    expect(allNumbers(r).every(Number.isFinite)).toBe(true);
  });

  it('measureCapture marks plots with levels, crossings and ramp fits in at most 1000 points', () => {
    const ch = measureCapture(captureOf([tri()]), { plotData: true }).channels[0];
    const w = ch.plot?.waveform;
    expect(w).toBeDefined();
    expect(w?.values.length).toBeLessThanOrEqual(1000);
    expect(w?.crossings.length).toBeGreaterThanOrEqual(6);
    expect(w?.slopeFits.length).toBeGreaterThanOrEqual(5);
    expectWithin(w?.highLevel, 3, { abs: 0.02 }, 'synthesized peak');
    // The plot spans about three and a half cycles (our choice).
    expectWithin((w?.values.length ?? 0) * (w?.dt ?? 0), 3.5 / 261.63, { rel: 0.02 }, '3.5 periods of 261.63 Hz');
    expect(measureCapture(captureOf([tri()])).channels[0].plot).toBeUndefined();
  });

  it('measureCapture measures the longest valid run and warns when a few samples are invalid', () => {
    const s = tri();
    s.values.fill(Number.NaN, 100, 110);
    const ch = measureCapture(captureOf([s])).channels[0];
    expect(ch.warnings.map((w) => w.code)).toContain('invalid-samples');
    expect(ch.warnings.find((w) => w.code === 'invalid-samples')?.message).toMatch(/10 samples are invalid; measured the longest valid run, samples 111–20000 \(99 % of the record\)/);
    expectWithin(ch.measurements.frequency?.value, 261.63, { rel: 1e-5 }, 'synthesized frequency');
  });

  it('measureCapture withholds everything with a note when no valid run is most of the record', () => {
    const s = tri();
    for (let i = 0; i < s.values.length; i += 50) s.values[i] = Number.NaN;
    const ch = measureCapture(captureOf([s])).channels[0];
    expect(ch.shape).toBe('unknown');
    const ms = Object.values(ch.measurements);
    expect(ms.length).toBeGreaterThan(0);
    for (const m of ms) {
      expect(m.value).toBeNull();
      expect(m.reason).toBe('invalid-samples');
      expect(m.note).toMatch(/400 of 20000 samples are invalid/);
    }
  });

  it('measureCapture withholds everything when the capture is too short to measure', () => {
    const s = synthesize({ ...kestrel, shape: 'sine', amplitude: 1, samples: 8 });
    const ch = measureCapture(captureOf([s])).channels[0];
    expect(ch.measurements.frequency?.reason).toBe('too-few-samples');
  });

  it('measureCapture flags possible aliasing when the frequency is near half the sample rate', () => {
    const s = synthesize({ shape: 'sine', frequency: 43_000, amplitude: 1, sampleRate: 100_000, samples: 20_000, phase: 0.1 });
    const ch = measureCapture(captureOf([s])).channels[0];
    expect(ch.warnings.map((w) => w.code)).toContain('aliasing');
  });

  it('measureCapture warns that it assumed volts for a channel without a unit', () => {
    const ch = measureCapture(captureOf([tri()], [{ unit: '' }])).channels[0];
    expect(ch.warnings.map((w) => w.code)).toContain('unit-assumed');
  });

  it('measureCapture reports a current channel in A and A/s', () => {
    const ch: ChannelReport = measureCapture(captureOf([tri()], [{ unit: 'A' }])).channels[0];
    expect(ch.measurements.highLevel?.unit).toBe('A');
    expect(ch.measurements.riseSlope?.unit).toBe('A/s');
    expect(ch.measurements.frequency?.unit).toBe('Hz');
  });

  it('measureCapture leaves the capture samples unmodified', () => {
    const a = tri();
    const b = pulse();
    const [ca, cb] = [Float64Array.from(a.values), Float64Array.from(b.values)];
    measureCapture(captureOf([a, b]), { plotData: true });
    expect(sameSamples(a.values, ca) && sameSamples(b.values, cb)).toBe(true);
  });

  it('measureCapture refuses a non-positive sample interval as a caller bug', () => {
    const c = { ...captureOf([tri()]), sampleInterval: 0 };
    expect(() => measureCapture(c)).toThrow(RangeError);
  });
});
