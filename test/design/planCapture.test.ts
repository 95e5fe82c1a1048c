import { describe, it, expect } from 'vitest';
import { bindCapture, matchCaptureName, parseSpec, planCapture } from '../../src/design/index.js';
import { BenchError } from '../../src/types/index.js';
import { captureStub, channel, report } from './handReports.js';

const spec = (pattern: string, outputs = 'tri: { channel: 1 }\n  pulse: { channel: "CH2" }') =>
  parseSpec(
    `name: m\nrevision: A\ncaptures: { pattern: "${pattern}" }\noutputs:\n  ${outputs}\nconditions:\n  low: { expect: { tri: { frequency: { nominal: 65.41 Hz, tolerance: 1 % } } } }\n  mid: { expect: { tri: { frequency: { nominal: 261.63 Hz, tolerance: 1 % } } } }\n`,
    'm.yaml',
  );

function benchError(f: () => unknown): BenchError {
  try {
    f();
  } catch (e) {
    if (e instanceof BenchError) return e;
    throw e;
  }
  throw new Error('expected a BenchError');
}

describe('matchCaptureName', () => {
  it('splits unit and condition when the unit itself holds the separator', () => {
    expect(matchCaptureName('{unit}_{condition}.csv', 'FK_0101_mid.csv', ['low', 'mid'], [])).toEqual({ unit: 'FK_0101', condition: 'mid' });
  });

  it('takes compressed captures and any letter case for conditions and outputs', () => {
    expect(matchCaptureName('{unit}_{condition}_{output}.csv', 'FK-0101_MID_Tri.csv.gz', ['low', 'mid'], ['tri', 'pulse'])).toEqual({ unit: 'FK-0101', condition: 'mid', output: 'tri' });
  });

  it('returns null when the name does not fit', () => {
    expect(matchCaptureName('{unit}_{condition}.csv', 'FK-0101-mid.csv', ['low', 'mid'], [])).toBeNull();
    expect(matchCaptureName('{unit}_{condition}.csv', 'FK-0101_loud.csv', ['low', 'mid'], [])).toBeNull();
  });
});

describe('planCapture', () => {
  it('maps {unit}_{condition}.csv to the unit, the condition and every output', () => {
    const p = planCapture(spec('{unit}_{condition}.csv'), 'caps/FK-0101_mid.csv');
    expect([p.unit, p.condition, p.perOutput]).toEqual(['FK-0101', 'mid', false]);
    expect(p.outputs).toEqual([{ output: 'tri', channel: 1 }, { output: 'pulse', channel: 'CH2' }]);
  });

  it('maps {output} through each output’s file tag', () => {
    const s = spec('{unit}_{condition}_{output}.csv', 'tri: { channel: 1, fileTag: t }\n  pulse: { channel: 1, fileTag: p }');
    const p = planCapture(s, 'FK-0101_low_p.csv');
    expect(p.outputs).toEqual([{ output: 'pulse', channel: 1 }]);
    expect(p.perOutput).toBe(true);
  });

  it('lets --unit and --condition override the name, and map a file that fits no pattern', () => {
    const p = planCapture(spec('{unit}_{condition}.csv'), 'scope-01.csv', { unit: 'FK-0107', condition: 'low' });
    expect([p.unit, p.condition]).toEqual(['FK-0107', 'low']);
  });

  it('refuses a file that matches nothing, saying which pattern it missed', () => {
    const e = benchError(() => planCapture(spec('{unit}_{condition}.csv'), 'caps/scope-01.csv'));
    expect(e.code).toBe('check.name-unmatched');
    expect(e.message).toMatchInlineSnapshot(`
      "caps/scope-01.csv: the file name "scope-01.csv" does not match the capture pattern "{unit}_{condition}.csv" of m.yaml
        expected: a name like "FK-0101_low.csv", with a condition among low, mid
        fix: rename the file to fit the pattern, or give --unit and --condition"
    `);
  });

  it('maps any name that fits the pattern to the single condition of a spec that lists none', () => {
    const s = parseSpec('name: m\nrevision: A\noutputs:\n  tri:\n    channel: 1\n    checks: [{ measure: frequency, nominal: 1 kHz, tolerance: 1 % }]\n', 'm.yaml');
    const p = planCapture(s, 'FK-0101_bench3.csv');
    expect([p.unit, p.condition]).toEqual(['FK-0101', 'default']);
  });

  it('refuses a --condition the spec does not define', () => {
    expect(benchError(() => planCapture(spec('{unit}_{condition}.csv'), 'FK-0101_mid.csv', { condition: 'hi' })).code).toBe('check.unknown-condition');
  });
});

describe('bindCapture', () => {
  const s = spec('{unit}_{condition}.csv');
  const plan = planCapture(s, 'FK-0101_mid.csv');

  it('binds each output to a channel by 1-based number or by name', () => {
    const r = report('FK-0101_mid.csv', [channel('CH1', 'triangle', {}), channel('CH2', 'pulse', {})]);
    const c = bindCapture(s, plan, captureStub('FK-0101_mid.csv', ['CH1', 'CH2']), r);
    expect(c.outputs.map((o) => [o.output, o.channel])).toEqual([['tri', 'CH1'], ['pulse', 'CH2']]);
    expect([c.unit, c.condition, c.size]).toEqual(['FK-0101', 'mid', 1234]);
    expect(c.layout).toContain('comma-separated');
  });

  it('refuses a capture that lacks the channel an output names, listing the channels it has', () => {
    const r = report('FK-0101_mid.csv', [channel('CH1', 'triangle', {})]);
    const e = benchError(() => bindCapture(s, plan, captureStub('FK-0101_mid.csv', ['CH1']), r));
    expect(e.code).toBe('check.no-channel');
    expect(e.message).toMatchInlineSnapshot(`
      "FK-0101_mid.csv: no channel "CH2" for output "pulse"
        expected: a channel of this capture: 1 "CH1"
        fix: set \`channel:\` of output "pulse" in m.yaml to one of them"
    `);
  });
});
