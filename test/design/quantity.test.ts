import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { formatQuantity, parseQuantity } from '../../src/design/index.js';
import { formatSpecQuantity } from '../../src/design/quantity.js';
import { expectWithin } from '../helpers/expectWithin.js';

// SI prefixes and their factors: SI Brochure (BIPM, 9th edition 2019), Table 7.
const SI = 'SI Brochure 9th ed., Table 7';

describe('parseQuantity', () => {
  it('reads the values a spec is written with, in SI units, when they carry a prefix and unit', () => {
    const cases: [string, number, string][] = [
      ['2.5 kHz', 2500, 'Hz'],
      ['40 mV', 0.04, 'V'],
      ['1.5 %', 1.5, '%'],
      ['6 Vpp', 6, 'V'],
      ['4.7 nF', 4.7e-9, 'F'],
      ['14.76 µA', 14.76e-6, 'A'],
      ['14.76 uA', 14.76e-6, 'A'],
      ['25 V/ms', 25_000, 'V/s'],
      ['3 mV/µs', 3000, 'V/s'],
      ['-3 V', -3, 'V'],
      ['−3 V', -3, 'V'],
      ['20µs', 20e-6, 's'],
      ['1e3 Hz', 1000, 'Hz'],
      ['-40 dBc', -40, 'dBc'],
      ['500 ppm', 0.05, '%'],
    ];
    for (const [text, value, unit] of cases) {
      const q = parseQuantity(text);
      expect(q?.unit, text).toBe(unit);
      expectWithin(q?.value, value, { rel: 1e-15 }, SI);
    }
  });

  it('takes a bare number as already in the measurement unit', () => {
    expect(parseQuantity(1.02)).toEqual({ value: 1.02, unit: '' });
    expect(parseQuantity('0.97')).toEqual({ value: 0.97, unit: '' });
  });

  it('refuses text that is not a number with a known unit', () => {
    for (const bad of ['', 'kHz', '2,5 kHz', '3 furlongs', '5 mdB', '5 k%', 'twelve volts', '1.2.3 V']) {
      expect(parseQuantity(bad), bad).toBeNull();
    }
    expect(parseQuantity(Number.NaN)).toBeNull();
  });

  it('scales any value by the prefix factor for every prefixable unit (property)', () => {
    const prefixes: [string, number][] = [['p', -12], ['n', -9], ['µ', -6], ['u', -6], ['m', -3], ['', 0], ['k', 3], ['M', 6], ['G', 9]];
    fc.assert(
      fc.property(
        fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true }),
        fc.constantFrom(...prefixes),
        fc.constantFrom('Hz', 's', 'V', 'A', 'F'),
        (v, [p, e], unit) => {
          const q = parseQuantity(`${v} ${p}${unit}`);
          expect(q?.unit).toBe(unit);
          expectWithin(q?.value, v * 10 ** e, { abs: Math.abs(v * 10 ** e) * 1e-14 }, SI);
        },
      ),
    );
  });

  it('reads back what formatQuantity writes (round trip property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-11, max: 1e9, noNaN: true }),
        fc.boolean(),
        fc.constantFrom('Hz', 's', 'V', 'A', 'F', 'V/s', '%', 'dB', ''),
        (mag, neg, unit) => {
          const v = neg ? -mag : mag;
          const q = parseQuantity(formatQuantity(v, unit, 15));
          expectWithin(parseQuantity(formatSpecQuantity(v, unit, 15))?.value, v, { rel: 1e-13 }, 'round trip of the spec-file form');
          expectWithin(q?.value, v, { rel: 1e-13 }, 'round trip (15 significant digits)');
        },
      ),
    );
  });
});

describe('formatQuantity', () => {
  it('picks the engineering prefix that leaves 1 to 999 in front, four-digit values unprefixed (SI Brochure Table 7)', () => {
    expect(formatQuantity(2093, 'Hz')).toBe('2 093 Hz');
    expect(formatSpecQuantity(2093, 'Hz')).toBe('2093 Hz');
    expect(formatSpecQuantity(-3, 'V')).toBe('-3 V');
    expect(formatQuantity(20_930, 'Hz')).toBe('20.93 kHz');
    expect(formatQuantity(4.7e-9, 'F')).toBe('4.7 nF');
    expect(formatQuantity(0.0148, 'V')).toBe('14.8 mV');
    expect(formatQuantity(-3, 'V')).toBe('\u22123 V');
    expect(formatQuantity(25_000, 'V/s')).toBe('25 kV/s');
    expect(formatQuantity(1.5, '%')).toBe('1.5 %');
    expect(formatQuantity(1.0833, '')).toBe('1.0833');
  });

  it('throws a RangeError for a value that is not finite (a caller bug)', () => {
    expect(() => formatQuantity(Number.POSITIVE_INFINITY, 'V')).toThrow(RangeError);
  });
});
