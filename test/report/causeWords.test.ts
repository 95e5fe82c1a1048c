import { describe, expect, it } from 'vitest';
import { causeEvidence, circuitSummary, describeDiagnosis, factText } from '../../src/report/index.js';
import type { Cause, CauseFact, CircuitView, Diagnosis } from '../../src/types/index.js';

// Facts built by hand with round numbers; the expected text follows JCGM 100:2008 (GUM) §7.2.6: U
// rounded UP to two significant digits, the value to the same decimal place, every ± labelled.
const frequency: CauseFact = {
  kind: 'measured',
  part: 'frequency',
  measurement: 'frequency',
  output: 'triangle',
  condition: 'mid',
  observed: { value: 246.7238, unit: 'Hz', expandedUncertainty: 0.01141 },
  expected: { value: 261.63, unit: 'Hz', basis: 'nominal' },
};
const capacitor: CauseFact = {
  kind: 'part',
  part: 'timing capacitor, effective',
  observed: { value: 4.98e-9, unit: 'F', expandedUncertainty: 3.4e-12 },
  design: { nominal: 4.7e-9, lower: 4.465e-9, upper: 4.935e-9, unit: 'F' },
  shareExplained: 0.997,
  confirm: 'measure the timing capacitor out of circuit on a capacitance meter',
};
const cause = (facts: CauseFact[], extra: Partial<Cause> = {}): Cause => ({ id: 'timing-capacitor', title: 'timing capacitor off its value', score: 1, evidence: [], confirm: capacitor.confirm!, facts, ...extra });

describe('factText writes a fact with the one formatter', () => {
  it('writes a measured quantity with U rounded up and labelled, against its nominal with the relative deviation', () => {
    // U = 0.01141 Hz rounds up to 0.012 Hz (GUM §7.2.6); 246.7238/261.63 − 1 = −5.697 % (arithmetic).
    expect(factText(frequency)).toBe('frequency on triangle at mid: 246.724 Hz ± 0.012 Hz (U, k = 2) against 261.63 Hz nominal (−5.70 %)');
  });

  it('writes a part against its design band in the value’s prefix, says it is above tolerance and how much it explains', () => {
    expect(factText(capacitor, cause([capacitor]))).toBe(
      'timing capacitor, effective: 4.9800 nF ± 0.0034 nF (U, k = 2) against 4.7 nF design (4.465 nF … 4.935 nF) (+5.96 %), above its tolerance; alone it would explain 100 % of the deviation',
    );
  });

  it('signs a derived relative change and gives three significant digits when it has no uncertainty', () => {
    const slope: CauseFact = { kind: 'derived', part: 'rising ramp slope against I/C', averagedOver: 3, observed: { value: -5.67879, unit: '%' } };
    const turn: CauseFact = { kind: 'derived', part: 'lower turn off its threshold, share of the swing', averagedOver: 3, observed: { value: 0.520833, unit: '%' } };
    expect(factText(slope)).toBe('rising ramp slope against I/C (mean over 3 conditions): −5.68 %');
    expect(factText(turn)).toBe('lower turn off its threshold, share of the swing (mean over 3 conditions): +0.521 %');
  });

  it('names a part the captures cannot tell apart, with the measurement that separates them', () => {
    const other: CauseFact = { kind: 'part', alternative: true, part: 'charge current', condition: 'mid', observed: { value: 13.9156e-6, unit: 'A', expandedUncertainty: 9.3e-9 }, design: { nominal: 14.76e-6, lower: 14.4648e-6, upper: 15.0552e-6, unit: 'A' }, shareExplained: 0.997, confirm: 'measure the charge current directly' };
    expect(factText(other, cause([capacitor, other]))).toBe(
      'the captures cannot tell this from the charge current at mid: 13.9156 µA ± 0.0093 µA (U, k = 2) against 14.76 µA design (14.46 µA … 15.06 µA) (−5.72 %), below its tolerance; alone it would explain 100 % of the deviation; to separate them: measure the charge current directly',
    );
  });
});

describe('causeEvidence and describeDiagnosis', () => {
  it('writes one line per fact, a heading per pattern taken over, then the remarks', () => {
    const taken: CauseFact = { ...frequency, pattern: { id: 'timing-scale', title: 'same frequency ratio at every condition' } };
    const lines = causeEvidence(cause([capacitor, taken], { remarks: ['same-ratio-everywhere'] }));
    expect(lines).toHaveLength(4);
    expect(lines[1]).toBe('seen as the pattern “same frequency ratio at every condition”:');
    expect(lines[2]).toBe(factText(frequency));
    expect(lines[3]).toContain('the same ratio at every condition');
  });

  it('keeps the text of a run stored before causes had facts', () => {
    expect(causeEvidence(cause([], { facts: undefined, evidence: ['frequency low by 5.7 % at every condition'] }))).toEqual(['frequency low by 5.7 % at every condition']);
  });

  it('fills evidence and summary for JSON readers without touching the facts, and survives a JSON round trip', () => {
    const d: Diagnosis = { causes: [cause([capacitor])], circuit: [{ condition: 'mid', figures: [], summary: [], gaps: [{ code: 'current-no-condition', key: 'chargeCurrent' }] }] };
    const described = describeDiagnosis(d);
    expect(described.causes[0].facts).toEqual(d.causes[0].facts);
    expect(described.causes[0].evidence).toEqual([factText(capacitor, d.causes[0])]);
    expect(described.circuit![0].summary).toEqual(['design.chargeCurrent names no condition (`at:`), and the conditions run at different frequencies; add `at:` to say where it holds']);
    expect(JSON.parse(JSON.stringify(described))).toEqual(described);
  });
});

describe('circuitSummary reads the circuit view from its figures', () => {
  // A core with 40 µA charging and 43 µA discharging: the sink runs 43/40 − 1 = 7.5 % hot (arithmetic).
  const view: CircuitView = {
    condition: 'bench',
    summary: [],
    figures: [
      { id: 'chargeCurrent', label: 'charge current', value: 40e-6, unit: 'A', uncertainty: 2.4e-6 },
      { id: 'dischargeCurrent', label: 'discharge current', value: 43e-6, unit: 'A', uncertainty: 2.6e-6 },
      { id: 'sinkVsSource', label: 'discharge vs charge current', value: 7.5, unit: '%', uncertainty: 0.16 },
      { id: 'logicHigh', label: 'output logic high', value: 10, unit: 'V', uncertainty: 0.058, design: 10, designTolerance: 0.3, deviation: 0, withinTolerance: true },
      { id: 'railHeadroom', label: 'logic high below the positive rail', value: 2, unit: 'V', uncertainty: 0.058 },
    ],
  };

  it('says how the currents match and how far the logic high sits below the rail, each ± labelled', () => {
    expect(circuitSummary(view)).toEqual([
      'charging at 40.0 µA ± 2.4 µA (U, k = 2), discharging at 43.0 µA ± 2.6 µA (U, k = 2) (taking C from the design): the sink runs 7.5 % hot',
      'logic high 10.000 V ± 0.058 V (U, k = 2) against 10 V ± 0.3 V design (+0.0 %), 2 V below the positive rail',
    ]);
  });

  it('keeps the summary of a run stored before the figures were worded by report', () => {
    expect(circuitSummary({ ...view, summary: ['charging at 40 µA'] })).toEqual(['charging at 40 µA']);
  });
});
