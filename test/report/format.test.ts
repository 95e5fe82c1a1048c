import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatQuantity, group, prefixExponent, quantityParts } from '../../src/report/format.js';

describe('formatQuantity', () => {
  it('formatQuantity writes 1 250.0030 Hz ± 0.0040 Hz (the house example, U to two digits)', () => {
    expect(formatQuantity(1250.003, 'Hz', 0.004)).toBe('1 250.0030 Hz ± 0.0040 Hz');
  });

  it('formatQuantity rounds the uncertainty up to two significant digits and the value to the same place (JCGM 100 §7.2.6)', () => {
    expect(formatQuantity(261.6300322, 'Hz', 0.0005158)).toBe('261.63003 Hz ± 0.00052 Hz');
    expect(formatQuantity(261.6300322, 'Hz', 0.0001558)).toBe('261.63003 Hz ± 0.00016 Hz');
    expect(formatQuantity(1.0834478, '', 0.0001098)).toBe('1.08345 ± 0.00011');
  });

  it('formatQuantity picks the SI prefix that brings the value to 1…999 (SI Brochure §3)', () => {
    expect(formatQuantity(0.0038221911, 's', 7.5e-9)).toBe('3.8221911 ms ± 0.0000075 ms');
    expect(formatQuantity(14.76e-6, 'A')).toBe('14.76 µA');
    expect(formatQuantity(25_116, 'V/s', 2.1)).toBe('25.1160 kV/s ± 0.0021 kV/s');
    expect(formatQuantity(2.5e6, 'Hz')).toBe('2.5 MHz');
  });

  it('formatQuantity keeps four-digit values unprefixed', () => {
    expect(formatQuantity(2093, 'Hz')).toBe('2 093 Hz');
    expect(prefixExponent(9999)).toBe(0);
    expect(prefixExponent(10_000)).toBe(3);
  });

  it('formatQuantity never prefixes %, dB or a ratio', () => {
    expect(formatQuantity(0.0012, '%', 0.0003)).toBe('0.00120 % ± 0.00030 %');
    expect(formatQuantity(-40.004, 'dBc', 0.02)).toBe('\u221240.004 dBc ± 0.020 dBc');
  });

  it('formatQuantity chooses the prefix from the uncertainty when it is larger than the value', () => {
    expect(formatQuantity(-5.06e-5, 'V', 9.66e-5)).toBe('\u221251 µV ± 97 µV');
    expect(formatQuantity(0, 'V', 0.001)).toBe('0.0 mV ± 1.0 mV');
  });

  it('formatQuantity marks an uncertainty below the digits it shows instead of printing zero', () => {
    expect(quantityParts(43_000, 'Hz', 5.7e-14).uncertainty).toBe('<0.00000001');
  });

  it('formatQuantity throws on a non-finite value, which is a caller bug', () => {
    expect(() => formatQuantity(Number.NaN, 'V')).toThrow(RangeError);
  });

  it('group separates thousands in the integer part only', () => {
    expect(group('-12345.678')).toBe('\u221212 345.678');
    expect(group('999.1234')).toBe('999.1234');
  });

  it('formatQuantity round-trips the value within its shown resolution (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.double({ min: 1e-6, max: 1e3, noNaN: true }), (v, u) => {
        const p = quantityParts(v, 'Hz', u);
        const exp = prefixExponent(Math.max(Math.abs(v), u));
        const shown = Number(p.value.replace(/ /g, '').replace('\u2212', '-')) * 10 ** exp;
        const decimals = (p.value.split('.')[1] ?? '').length;
        expect(Math.abs(shown - v)).toBeLessThanOrEqual(0.5 * 10 ** (exp - decimals) * (1 + 1e-9) + 1e-9 * Math.abs(v));
      }),
    );
  });
});
