import { describe, expect, it } from 'vitest';
import { decideCalibration, expectedFrequency } from '../../src/design/index.js';
import { guideTrim } from '../../src/diagnose/index.js';
import { trimText } from '../../src/report/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { givenReading, kestrelSpec, measuredReading, specWith, unitFrequency } from './kestrelCalibration.js';

const spec = kestrelSpec();
const CONTROLS = [0, 1, 2, 3, 4, 5];

describe('decideCalibration on synthetic captures', () => {
  it('decideCalibration recovers a 0.987 octave/V scale and a −100.9 cent offset from measured triangles', () => {
    const offset = 1200 * Math.log2(1 / 1.06); // a timing capacitor 6 % high: −100.88 cents
    const readings = CONTROLS.map((c, i) => measuredReading(spec, i, unitFrequency(c, 0.987, offset), 500 + i));
    const d = decideCalibration(spec, 'FK-0104', readings);
    const t = d.tracking;
    expectWithin(t.scale?.value, 0.987, { abs: 2e-4 }, 'closed form of the synthesized law (demo values)');
    expectWithin(t.scaleError?.value, 1200 * (0.987 - 1), { abs: 0.3 }, 'closed form: 1200·(k − 1) = −15.6 cents per octave (issue 8)');
    expectWithin(t.offset?.value, offset, { abs: 0.5 }, 'closed form: 1200·log2(1/1.06)');
    // The fit's stated uncertainty must cover what it actually missed by (k = 3 allows for chance).
    expect(Math.abs((t.scale?.value ?? 0) - 0.987)).toBeLessThan(3 * (t.scale?.uncertainty ?? 0) + 1e-6);
    expectWithin(t.span?.value, 5 * 0.987, { abs: 1e-3 }, 'closed form: span = 5 V × 0.987 octave/V');
    expect(d.statement).toBe('fail');
    expect(d.meetsLimits).toBe(false);
  });

  it('decideCalibration passes a unit on its law, every step within ±5 cents', () => {
    const readings = CONTROLS.map((c, i) => measuredReading(spec, i, unitFrequency(c, 1, 0.5), 700 + i));
    const d = decideCalibration(spec, 'FK-0101', readings);
    expect(d.steps.map((s) => s.statement)).toEqual(CONTROLS.map(() => 'pass'));
    expect(d.tracking.linearityStatement).toBe('pass');
    expect(d.meetsLimits).toBe(true);
  });
});

describe('decideCalibration on given readings', () => {
  it('decideCalibration reports −0.831 cents for 523.0 Hz at 1 V with C4 at 0 V', () => {
    const c4 = specWith('  law: exponential\n  scale: 1 V/octave\n  reference: { control: 0 V, frequency: 261.6256 Hz }\n  steps: [0 V, 1 V]\n  limits: { error: 5 cents }\n');
    const d = decideCalibration(c4, 'X', [givenReading(c4, 0, 261.6256), givenReading(c4, 1, 523.0)]);
    expectWithin(d.steps[1].expected, 523.2512, { abs: 1e-4 }, 'REFERENCES.md test case 14');
    expectWithin(d.steps[1].cents, -0.831, { abs: 0.01 }, 'REFERENCES.md test case 14');
  });

  it('expectedFrequency follows 1 V/octave from C4: 261.63, 523.25, 1046.50, 2093.00 Hz', () => {
    const c4 = specWith('  law: exponential\n  scale: 1 octave/V\n  reference: { control: 0 V, frequency: 261.6256 Hz }\n  steps: [0 V, 1 V, 2 V, 3 V]\n  limits: { error: 5 cents }\n');
    const want = [261.63, 523.25, 1046.5, 2093.0];
    c4.calibration!.steps.forEach((s, i) => expectWithin(expectedFrequency(c4.calibration!.law, s, 4), want[i], { abs: 0.006 }, 'REFERENCES.md test case 14'));
  });

  it('decideCalibration gives a range law 8.00 octaves for a 256:1 span and decides only its ends', () => {
    const r = specWith('  law: range\n  range: { low: 20 Hz, high: 5.12 kHz }\n  steps: [ccw, middle, cw]\n  limits: { error: 10 cents }\n');
    const d = decideCalibration(r, 'X', [givenReading(r, 0, 20), givenReading(r, 1, 300), givenReading(r, 2, 5120)]);
    expectWithin(d.tracking.span?.value, 8, { abs: 1e-9 }, 'closed form: log2(256) = 8 (issue 8)');
    expectWithin(d.tracking.expectedSpan, 8, { abs: 1e-12 }, 'closed form');
    expect(d.steps.map((s) => s.statement)).toEqual(['pass', null, 'pass']);
  });

  it('decideCalibration withholds a step it could not measure and does not meet its limits', () => {
    const readings = CONTROLS.map((c, i) => givenReading(spec, i, i === 3 ? null : unitFrequency(c, 1, 0)));
    const d = decideCalibration(spec, 'FK-0101', readings);
    expect(d.steps[3].statement).toBe('not-measured');
    expect(d.steps[3].note).toMatch(/fewer than two cycles/);
    expect(d.statement).toBe('not-measured');
    expect(d.meetsLimits).toBe(false);
  });

  it('decideCalibration fits a linear law in Hz per volt', () => {
    const lin = specWith('  law: linear\n  scale: 100 Hz/V\n  reference: { control: 0 V, frequency: 50 Hz }\n  steps: [0 V, 2 V, 4 V, 6 V]\n  limits: { error: 5 cents }\n');
    const d = decideCalibration(lin, 'X', [0, 2, 4, 6].map((c, i) => givenReading(lin, i, 50 + 101 * c)));
    expectWithin(d.tracking.scale?.value, 101, { rel: 1e-9 }, 'closed form of the given readings');
    expectWithin(d.tracking.scaleError?.value, 1, { abs: 1e-7 }, 'closed form: 101/100 − 1 = +1 %');
  });
});

describe('guideTrim', () => {
  const guide = (k: number, offsetCents: number, delay = 0) => {
    const d = decideCalibration(spec, 'FK-0104', CONTROLS.map((c, i) => givenReading(spec, i, unitFrequency(c, k, offsetCents, delay))));
    return guideTrim(spec, d);
  };
  const advice = (it: ReturnType<typeof guide>, a: string) => it.guidance.find((g) => g.adjustment === a);

  it('guideTrim says raise the scale when the scale is too low, by k/b − 1', () => {
    const g = advice(guide(0.987, 0), 'scale');
    expect(g?.action).toBe('raise');
    expectWithin(g?.amount, 100 * (1 / 0.987 - 1), { abs: 1e-6 }, 'closed form: 1/0.987 − 1 = 1.317 %');
    // The words are report's (src/report/trimText.ts); diagnose gives the fitted scale as data.
    expectWithin(g?.basis?.figures.find((f) => f.name === 'fitted-scale')?.value, 0.987, { abs: 0.001 }, 'given readings at scale 0.987');
    expect(trimText(g!)).toMatch(/^scale: raise by 1\.3 %/);
  });

  it('guideTrim says lower the scale when the scale is too high', () => {
    expect(advice(guide(1.01, 0), 'scale')?.action).toBe('lower');
  });

  it('guideTrim says lower the offset by the error at 0 V when every step is sharp', () => {
    const g = advice(guide(1, 20), 'offset');
    expect(g?.action).toBe('lower');
    expectWithin(g?.amount, 20, { abs: 1e-6 }, 'closed form of the given readings');
  });

  it('guideTrim leaves scale and offset alone on a unit on its law', () => {
    const it = guide(1, 0.3);
    expect(it.guidance.map((g) => g.action)).toEqual(['leave', 'leave', 'leave']);
  });

  it('guideTrim asks for more high-frequency compensation when the top step runs flat', () => {
    const it = guide(1, 0, 2e-6); // a 2 µs switching delay: 1200·log2(1 + 4·2 µs·2093 Hz) = 28.7 cents flat at 5 V (closed form)
    const hf = advice(it, 'high-frequency');
    expect(hf?.action).toBe('raise');
    expect(hf?.basis?.topStep).toBe('5 V');
    expect(trimText(hf!)).toMatch(/the 5 V step moves up/);
  });
});
