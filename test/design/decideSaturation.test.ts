/**
 * A circuit flat top (the output saturating inside the scope's range) is a fault: checks of what it
 * changes fail whatever their value; checks it leaves alone are decided as usual (ILAC-G8 §4.2.3).
 * Hand-built reports with invented numbers.
 */
import { describe, expect, it } from 'vitest';
import { bindCapture, decideUnit, parseSpec, planCapture } from '../../src/design/index.js';
import type { ChannelReport, FlatTop } from '../../src/types/index.js';
import { captureStub, channel, report } from './handReports.js';

const spec = parseSpec(
  ['name: sat', 'revision: A', 'outputs:', '  out:', '    channel: 1', '    checks:', '      - { measure: frequency, nominal: 1 kHz, tolerance: 1 % }', '      - { measure: peakToPeak, nominal: 6 V, tolerance: 10 % }', '      - { measure: minimum, min: -3.3 V }'].join('\n'),
  's.yaml',
);

function decide(flatTops: readonly FlatTop[]) {
  const ch: ChannelReport = { ...channel('CH1', 'triangle', { frequency: [1000, 0.1], peakToPeak: [5.7, 0.001], minimum: [-3, 0.001] }), flatTops };
  const path = 'U1_default.csv';
  return decideUnit(spec, 'U1', [bindCapture(spec, planCapture(spec, path), captureStub(path, ['CH1']), report(path, [ch]))]);
}

const statements = (v: ReturnType<typeof decide>): Record<string, string> => Object.fromEntries(v.conditions[0].checks.map((k) => [k.measurement, k.statement]));

describe('decideUnit on a saturating output', () => {
  it('decideUnit fails the swing of a channel flat on its top inside the scope range, even inside the limits, and leaves the frequency and the other side alone', () => {
    const v = decide([{ side: 'high', level: 2.7, share: 0.05, samples: 500, cause: 'circuit' }]);
    expect(statements(v)).toEqual({ frequency: 'pass', peakToPeak: 'fail', minimum: 'pass' });
    expect(v.conditions[0].checks.find((k) => k.measurement === 'peakToPeak')?.note).toMatch(/saturates \(flat top at 2\.7 V for 5 % of each cycle/);
  });

  it('decideUnit decides as usual when the flat top is the scope’s clipping (its values were withheld upstream)', () => {
    expect(statements(decide([{ side: 'high', level: 2.7, share: 0.05, samples: 500, cause: 'scope-range', fullScaleFrom: 'converter-codes' }]))).toEqual({ frequency: 'pass', peakToPeak: 'pass', minimum: 'pass' });
  });
});
