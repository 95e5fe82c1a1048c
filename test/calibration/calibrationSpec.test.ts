import { describe, expect, it } from 'vitest';
import { parseSpec, planCalibration } from '../../src/design/index.js';
import { BenchError } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { kestrelSpec, specText, specWith } from './kestrelCalibration.js';

function errorOf(fn: () => unknown): BenchError {
  try {
    fn();
  } catch (e) {
    if (e instanceof BenchError) return e;
    throw e;
  }
  throw new Error('expected a BenchError');
}

describe('the calibration section of a spec', () => {
  it('parseSpec reads the demo calibration: 1 octave/V, 65.41 Hz at 0 V, six steps, ±5 cents', () => {
    const c = kestrelSpec().calibration!;
    expect(c.law.kind).toBe('exponential');
    expectWithin(c.law.scale, 1, { abs: 0 }, 'samples/fh210-spec.yaml (1 V/octave, common practice)');
    expectWithin(c.law.referenceFrequency, 65.41, { abs: 0 }, 'samples/fh210-spec.yaml');
    expect(c.steps.map((s) => s.label)).toEqual(['0', '1', '2', '3', '4', '5']);
    expect(c.limits).toEqual({ errorCents: 5, linearityCents: 3 });
    expect(c.output).toBe('triangle');
    expect(c.channel).toBe(1);
  });

  it('parseSpec reads "2 V/octave" as half an octave per volt and "500 mV" as 0.5 V', () => {
    const c = specWith('  law: exponential\n  scale: 2 V/octave\n  reference: { control: 500 mV, frequency: 1 kHz }\n  steps: [0 V, 2 V]\n  limits: { error: 3 ct }\n').calibration!;
    expectWithin(c.law.scale, 0.5, { abs: 1e-15 }, 'closed form');
    expectWithin(c.law.referenceControl, 0.5, { abs: 1e-15 }, 'SI prefix m = 10⁻³ (SI Brochure Table 7)');
    expectWithin(c.law.referenceFrequency, 1000, { abs: 0 }, 'SI prefix k');
  });

  it('a spec without a calibration section stays valid', () => {
    const plain = parseSpec(specText().split('\ncalibration:')[0], 'plain.yaml');
    expect(plain.calibration).toBeUndefined();
  });

  it('parseSpec lists every calibration mistake at once with its path', () => {
    const e = errorOf(() => specWith('  output: tri\n  law: exponential\n  pattern: "{unit}_{condition}.csv"\n  steps: [0 V, 1 V]\n  limits: { error: lots }\n'));
    const problems = (e.issues ?? []).map((i) => `${i.code} ${i.problem}`);
    expect(problems).toEqual(
      expect.arrayContaining([
        expect.stringMatching(/^spec\.unknown-output calibration\.output: no output named "tri"/),
        expect.stringMatching(/^spec\.missing-field calibration\.scale: missing/),
        expect.stringMatching(/^spec\.missing-field calibration\.reference: missing/),
        expect.stringMatching(/^spec\.bad-value calibration\.limits\.error/),
        expect.stringMatching(/^spec\.bad-pattern calibration\.pattern: unknown token \{condition\}/),
      ]),
    );
  });

  it('parseSpec refuses an unknown calibration field and suggests the nearest', () => {
    const e = errorOf(() => specWith('  law: range\n  range: { low: 20 Hz, high: 5 kHz }\n  steps: [ccw, cw]\n  limits: { error: 5 cents }\n  limts: {}\n'));
    expect(e.issues?.[0]).toMatchObject({ code: 'spec.unknown-field', fix: 'did you mean "limits"? rename the field' });
  });
});

describe('planCalibration', () => {
  const spec = kestrelSpec();
  const names = (prefix: string): string[] => [0, 1, 2, 3, 4, 5].map((v) => `${prefix}FK-0104_cv${v}.csv`);

  it('planCalibration places files at their steps by name, whatever their order', () => {
    const plan = planCalibration(spec, [...names('bench/')].reverse(), 'FK-0104');
    expect(plan.map((p) => p.path)).toEqual(names('bench/'));
  });

  it('planCalibration takes files in step order when none fits the pattern', () => {
    const files = ['a.csv', 'b.csv', 'c.csv', 'd.csv', 'e.csv', 'f.csv'];
    expect(planCalibration(spec, files, 'FK-0104').map((p) => `${p.step.label}:${p.path}`)).toEqual(['0:a.csv', '1:b.csv', '2:c.csv', '3:d.csv', '4:e.csv', '5:f.csv']);
  });

  it('planCalibration names the missing steps', () => {
    const e = errorOf(() => planCalibration(spec, names('').slice(0, 4), 'FK-0104'));
    expect(e.code).toBe('calibration.missing-step');
    expect(e.message).toMatchInlineSnapshot(`
      "-: no capture for steps "4", "5"
        expected: one capture for each of the 6 steps of samples/fh210-spec.yaml
        fix: capture the missing steps, named e.g. FK-0104_cv4.csv"
    `);
  });

  it('planCalibration refuses a capture of another unit and a step given twice', () => {
    expect(errorOf(() => planCalibration(spec, [...names('').slice(1), 'FK-0105_cv0.csv'], 'FK-0104')).code).toBe('calibration.other-unit');
    expect(errorOf(() => planCalibration(spec, [...names(''), 'x/FK-0104_cv2.csv'], 'FK-0104')).code).toBe('calibration.duplicate-step');
    expect(errorOf(() => planCalibration(spec, ['a.csv'], 'FK-0104')).code).toBe('calibration.step-count');
    expect(errorOf(() => planCalibration(spec, [...names('').slice(1), 'odd.csv'], 'FK-0104')).code).toBe('calibration.name-unmatched');
  });

  it('planCalibration says how to add a calibration section when the spec has none', () => {
    const plain = parseSpec(specText().split('\ncalibration:')[0], 'plain.yaml');
    expect(errorOf(() => planCalibration(plain, names(''), 'FK-0104')).code).toBe('calibration.no-section');
  });
});
