import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { cents, centsUncertainty, shiftByCents, spanOctaves } from '../../src/analysis/index.js';
import { expectWithin } from '../helpers/expectWithin.js';

// Worked values: ../shared/REFERENCES.md §9 and test case 14 (cents = 1200·log2(f2/f1), Ellis;
// Howard & Angus, Acoustics and Psychoacoustics, App. 3). A4 = 440 Hz: ISO 16:1975.
const A4 = 440;
const SRC = 'REFERENCES.md §9 (Howard & Angus App. 3; values computed there)';

describe('cents', () => {
  it('cents gives +3.930 for 441 Hz against the ISO 16 A4 of 440 Hz', () => {
    expectWithin(cents(441, A4), 3.93, { abs: 0.0005 }, SRC);
  });

  it('cents gives −3.939 for 439 Hz against 440 Hz', () => {
    expectWithin(cents(439, A4), -3.939, { abs: 0.0005 }, SRC);
  });

  it('cents gives 1200 for an octave and 100 for an equal-tempered semitone', () => {
    expectWithin(cents(880, A4), 1200, { abs: 1e-9 }, 'definition of the cent (one octave = 1200 cents)');
    expectWithin(cents(A4 * 1.059463094, A4), 100, { abs: 1e-6 }, 'REFERENCES.md §9: 2^(1/12) = 1.059463094');
  });

  it('shiftByCents puts 12-TET C4 at 261.6256 Hz, nine semitones below A4', () => {
    expectWithin(shiftByCents(A4, -900), 261.6256, { abs: 5e-5 }, 'REFERENCES.md §9: f(m) = 440·2^((m − 69)/12), m = 60');
  });

  it('cents gives −0.831 for 523.0 Hz measured at 1 V when C4 sits at 0 V (1 V/octave)', () => {
    const c4 = A4 * 2 ** (-9 / 12);
    const expected = c4 * 2 ** 1;
    expectWithin(expected, 523.2511, { abs: 5e-5 }, 'REFERENCES.md test case 14');
    expectWithin(cents(523.0, expected), -0.831, { abs: 0.01 }, 'REFERENCES.md test case 14');
  });

  it('spanOctaves gives 8.00 octaves for a 256:1 range', () => {
    expectWithin(spanOctaves(20, 5120), 8, { abs: 1e-12 }, 'closed form: log2(256) = 8 (issue 8)');
  });

  it('centsUncertainty propagates 1 Hz at 440 Hz to 1200/(440·ln 2) cents', () => {
    expectWithin(centsUncertainty(440, 1), 1200 / (440 * Math.LN2), { rel: 1e-12 }, 'JCGM 100:2008 §5.1.2, first-order propagation');
    expectWithin(centsUncertainty(440, 1), (cents(440.001, 440) - cents(439.999, 440)) / 0.002, { rel: 1e-6 }, 'numerical derivative of the closed form');
  });

  it('cents refuses a frequency that is not positive, quoting it', () => {
    expect(() => cents(0, 440)).toThrow(RangeError);
    expect(() => cents(440, -1)).toThrow(/-1/);
    expect(() => centsUncertainty(440, -0.1)).toThrow(RangeError);
  });

  it('cents is antisymmetric and adds along a chain of ratios (property)', () => {
    const f = fc.double({ min: 1, max: 1e5, noNaN: true });
    fc.assert(
      fc.property(f, f, f, (a, b, c) => {
        expect(Math.abs(cents(a, b) + cents(b, a))).toBeLessThan(1e-9);
        expect(Math.abs(cents(a, c) - cents(a, b) - cents(b, c))).toBeLessThan(1e-8);
      }),
    );
  });

  it('cents depends only on the ratio, not on the frequency scale (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 1e4, noNaN: true }), fc.double({ min: 0.5, max: 2, noNaN: true }), fc.double({ min: 1e-3, max: 1e3, noNaN: true }), (f, r, k) => {
        expect(Math.abs(cents(f * r * k, f * k) - cents(r, 1))).toBeLessThan(1e-8);
      }),
    );
  });
});
