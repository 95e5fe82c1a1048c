import { describe, expect, it } from 'vitest';
import { describeIteration, iterationNotes, trimText } from '../../src/report/index.js';
import type { CalibrationIteration, TrimAdvice } from '../../src/types/index.js';

// Advice built by hand as src/diagnose gives it (data, no words); the expected sentences follow from
// the numbers by arithmetic: 1200·(0.987 − 1) = −15.6 cents per octave; a −20 cent move is
// 2^(−20/1200) − 1 = −1.15 % in frequency (equal temperament, 1200 cents per octave).
const scale: TrimAdvice = {
  adjustment: 'scale', action: 'raise', amount: 1.317, unit: '%', text: '',
  basis: { figures: [{ name: 'fitted-scale', value: 0.987, unit: 'octave/V' }, { name: 'scale-error', value: -15.6, unit: 'cents per octave' }] },
};
const offset: TrimAdvice = { adjustment: 'offset', action: 'lower', amount: 20, unit: 'cents', text: '', basis: { figures: [{ name: 'offset', value: 20, unit: 'cents' }], at: { control: 0, controlUnit: 'V' }, afterScale: true } };

describe('trimText words trim guidance from its data', () => {
  it('writes the scale trim with its amount and the fitted scale it reads, the minus sign U+2212', () => {
    expect(trimText(scale)).toBe('scale: raise by 1.3 % (the fitted scale is 0.9870 octave/V, −15.6 cents per octave)');
  });

  it('writes the offset trim with where it holds and its share in frequency', () => {
    expect(trimText(offset)).toBe('offset: lower by 20.0 cents (at 0 V, after the scale trim, −1.15 % in frequency)');
  });

  it('says why the high-frequency compensation is left when too few steps were captured', () => {
    expect(trimText({ adjustment: 'high-frequency', action: 'leave', amount: null, unit: 'cents', text: '', basis: { figures: [], undecided: 'too-few-steps' } })).toBe(
      'high-frequency compensation: leave as is (fewer than four steps: cannot be told from scale)',
    );
  });

  it('keeps the text of advice stored before it carried its basis', () => {
    expect(trimText({ adjustment: 'scale', action: 'leave', amount: null, unit: '%', text: 'scale: leave as is (+0.4 cents per octave)' })).toBe('scale: leave as is (+0.4 cents per octave)');
  });

  it('writes the remarks into the notes once, however often the iteration is described', () => {
    const it0 = { guidance: [scale], notes: ['step 3 left out of the fit'], remarks: [{ code: 'pivot-at-zero' }, { code: 'symmetry-drift', first: 50.1, last: 47.6, spread: 2.5 }] } as unknown as CalibrationIteration;
    const once = describeIteration(it0);
    expect(once.guidance[0].text).toBe(trimText(scale));
    expect(once.notes).toHaveLength(3);
    expect(once.notes[2]).toBe('symmetry moves across the range (50.1 % → 47.6 %, spread 2.5 points): charge and discharge currents do not track the control equally');
    expect(describeIteration(once).notes).toEqual(once.notes);
    expect(iterationNotes(once)).toEqual(once.notes);
  });
});
