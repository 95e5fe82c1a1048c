import { describe, it, expect } from 'vitest';
import { batchRemarkWords, measurementNotes } from '../../src/report/batchRemarks.js';
import type { MeasurementStats } from '../../src/types/index.js';

// The batch statistics give their remarks as data; the words, and the numbers in them, are made here
// with the reports' one formatter (common practice (no source): one voice for numbers in every report).
const stats = (over: Partial<MeasurementStats>): MeasurementStats => ({
  condition: 'mid', output: 'triangle', measurement: 'frequency', unit: 'Hz',
  lower: 256.4, upper: 266.9, nominal: 261.63, count: 6, withheld: 0, mean: 261.6, sd: 0.0123, min: 261.58, max: 261.62,
  cp: null, cpu: null, cpl: null, cpk: null, remarks: [], values: [], ...over,
});

describe('batch remarks in words', () => {
  it('words the spread below the standard uncertainty in the quantity\'s unit and prefix, two significant digits', () => {
    const m = stats({ remarks: [{ kind: 'spread-below-u', sd: 0.01234, u: 0.0456 }] });
    expect(measurementNotes(m)).toEqual([
      'spread between units (s = ' + '0.012 Hz) below the measurement\'s standard uncertainty (u = 0.046 Hz): no Cp/Cpk, they would describe the measurement, not the units',
    ]);
    const mv = stats({ unit: 'V', mean: 0.004, min: 0.0039, max: 0.0041, lower: null, upper: 0.005, remarks: [{ kind: 'spread-below-u', sd: 0.0000567, u: 0.000123 }] });
    expect(measurementNotes(mv)[0]).toMatch(/^spread between units \(s = 0\.057 mV\) below .*\(u = 0\.12 mV\)/);
  });

  it('counts units in the singular and plural and names every revision', () => {
    expect(batchRemarkWords({ kind: 'withheld', units: 1 })).toBe('1 unit not measured, left out');
    expect(batchRemarkWords({ kind: 'withheld', units: 3 })).toBe('3 units not measured, left out');
    expect(batchRemarkWords({ kind: 'few-units', units: 4 })).toBe('only 4 units: Cp/Cpk are rough estimates');
    expect(batchRemarkWords({ kind: 'several-revisions', revisions: ['B', 'C'] })).toBe('runs were checked under 2 spec revisions (B, C)');
  });
});
