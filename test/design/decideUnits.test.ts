import { describe, it, expect } from 'vitest';
import { bindCapture, decideUnit, decideUnits, parseSpec, planCapture } from '../../src/design/index.js';
import type { Spec } from '../../src/design/index.js';
import type { ChannelReport, CheckedCapture } from '../../src/types/index.js';
import { BenchError } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { captureStub, channel, report } from './handReports.js';

// Limits of an upper-limited check reuse the ILAC-G8 worked example (REFERENCES test case 15):
// TL = 1.000 V, U = 0.020 V, i.e. u = 0.010 V with k = 2.
const spec: Spec = parseSpec(
  [
    'name: m',
    'revision: A',
    'outputs:',
    '  out:',
    '    channel: 1',
    '    checks:',
    '      - measure: maximum',
    '        max: 1.000 V',
    '        hint: look at the clamp diode',
    '      - measure: frequency',
    '        tolerance: 1 %',
    'conditions:',
    '  low: { expect: { out: { frequency: { nominal: 100 Hz } } } }',
    '  high: { expect: { out: { frequency: { nominal: 1 kHz } } } }',
  ].join('\n'),
  'm.yaml',
);

function captured(unit: string, condition: string, ch: ChannelReport): CheckedCapture {
  const path = `${unit}_${condition}.csv`;
  return bindCapture(spec, planCapture(spec, path), captureStub(path, [ch.name]), report(path, [ch]));
}

const good = (unit: string, cond: string, f: number, max: [number, number | null] = [0.975, 0.01]) =>
  captured(unit, cond, channel('CH1', 'triangle', { maximum: max, frequency: [f, 0.01] }));

describe('decideUnit', () => {
  it('passes a unit whose every check is further than U inside its limits', () => {
    const v = decideUnit(spec, 'FK-0101', [good('FK-0101', 'low', 100.2), good('FK-0101', 'high', 1001)]);
    expect(v.statement).toBe('pass');
    expect(v.conditions.map((c) => c.statement)).toEqual(['pass', 'pass']);
    const max = v.conditions[0].checks.find((c) => c.measurement === 'maximum')!;
    expectWithin(max.expandedUncertainty, 0.02, { rel: 1e-12 }, 'U = 2u (GUM §6.2, k = 2)');
    expectWithin(max.margin, 0.025, { abs: 1e-12 }, 'TL − x (REFERENCES test case 15)');
    expect(max.hint).toBeUndefined();
  });

  it('gives the ILAC-G8 conditional statements and shows the user’s hint when not a pass', () => {
    const v = decideUnit(spec, 'FK-0101', [good('FK-0101', 'low', 100, [0.99, 0.01]), good('FK-0101', 'high', 1000, [1.01, 0.01])]);
    expect(v.conditions.map((c) => c.statement)).toEqual(['conditional-pass', 'conditional-fail']);
    expect(v.statement).toBe('conditional-fail');
    expect(v.conditions[1].checks[0].hint).toBe('look at the clamp diode');
  });

  it('reports a withheld measurement as not measured with its note, and the unit does not pass', () => {
    const ch = channel('CH1', 'triangle', { maximum: [0.5, 0.01], frequency: null }, { frequency: 'only 1 whole period in the capture' });
    const v = decideUnit(spec, 'FK-0101', [captured('FK-0101', 'low', ch), good('FK-0101', 'high', 1000)]);
    const f = v.conditions[0].checks.find((c) => c.measurement === 'frequency')!;
    expect([f.statement, f.value, f.margin, f.note]).toEqual(['not-measured', null, null, 'withheld: only 1 whole period in the capture']);
    expect(v.statement).toBe('not-measured');
  });

  it('reports checks of a condition without a capture (waiting), or a measurement the analysis did not report, as not measured', () => {
    const noMax = captured('FK-0101', 'low', channel('CH1', 'triangle', { frequency: [100, 0.01] }));
    const v = decideUnit(spec, 'FK-0101', [noMax]);
    expect(v.conditions[0].checks[0].note).toBe('the analysis reports no maximum for channel "CH1" (recognised as triangle)');
    expect(v.conditions[1].checks.every((c) => c.statement === 'not-measured')).toBe(true);
    expect(v.conditions[1]).toMatchObject({ waiting: true });
    expect(v.conditions[1].checks[0].note).toBe('waiting for a capture at condition "high"');
  });

  it('decides without a guard band, and says so, when the analysis gives no uncertainty', () => {
    const v = decideUnit(spec, 'FK-0101', [good('FK-0101', 'low', 100, [0.99, null]), good('FK-0101', 'high', 1000)]);
    const max = v.conditions[0].checks[0];
    expect([max.statement, max.expandedUncertainty, max.guard]).toEqual(['pass', null, 0]);
    expect(max.note).toBe('no uncertainty estimate: decided without a guard band');
  });

  it('notes when the guard band covers the whole tolerance, so no pass is possible', () => {
    const v = decideUnit(spec, 'FK-0101', [captured('FK-0101', 'low', channel('CH1', 'triangle', { maximum: [0.5, 0.01], frequency: [100, 0.6] })), good('FK-0101', 'high', 1000)]);
    const f = v.conditions[0].checks[1];
    expect(f.statement).toBe('conditional-pass');
    expect(f.note).toContain('covers the whole tolerance');
  });

  it('refuses two captures of the same output and condition for one unit', () => {
    expect(() => decideUnit(spec, 'FK-0101', [good('FK-0101', 'low', 100), good('FK-0101', 'low', 100)])).toThrow(BenchError);
  });

  it('survives a JSON round trip unchanged (plain data)', () => {
    const v = decideUnit(spec, 'FK-0101', [good('FK-0101', 'low', 100), good('FK-0101', 'high', 1000)]);
    expect(JSON.parse(JSON.stringify(v))).toEqual(v);
  });
});

describe('decideUnits', () => {
  it('groups captures by unit in the order first seen', () => {
    const vs = decideUnits(spec, [good('FK-0102', 'low', 100), good('FK-0101', 'low', 100), good('FK-0102', 'high', 1000)]);
    expect(vs.map((v) => [v.unit, v.captures.length])).toEqual([['FK-0102', 2], ['FK-0101', 1]]);
  });
});
