import { describe, expect, it } from 'vitest';
import { formatLimits, formatMargin, formatMeasured, formatQuantity, formatTime } from '../../src/report/reportNumbers.js';

// Expected strings follow JCGM 100:2008 (GUM) §7.2.6: U with at most two significant digits, the value
// rounded to the same decimal place; SI prefixes as in the SI Brochure (BIPM, 9th ed., Table 7).
describe('number formatting in records', () => {
  it('rounds U up to two significant digits and the value to the same place', () => {
    // 0.010456 rounds up to 0.011, never down to 0.010 (GUM §7.2.6: the shown interval is not narrower).
    expect(formatMeasured(261.63412, 0.010456, 'Hz')).toBe('261.634 Hz ± 0.011 Hz');
    expect(formatMeasured(1968.273, 0.01141, 'Hz')).toBe('1 968.273 Hz ± 0.012 Hz');
    expect(formatMeasured(6.0012, 0.012, 'V')).toBe('6.001 V ± 0.012 V');
    expect(formatMeasured(48.04, 0.1, '%')).toBe('48.04 % ± 0.10 %');
    expect(formatMeasured(1.0833, 0.004, '')).toBe('1.0833 ± 0.0040');
  });

  it('keeps four-digit values unprefixed and prefixes from five digits on (SI Brochure Table 7 steps of 10³)', () => {
    expect(formatMeasured(2093.0, 0.084, 'Hz')).toBe('2 093.000 Hz ± 0.084 Hz');
    expect(formatMeasured(2093.0, 4.2, 'Hz')).toBe('2 093.0 Hz ± 4.2 Hz');
    expect(formatMeasured(20_930, 42, 'Hz')).toBe('20.930 kHz ± 0.042 kHz');
    expect(formatMeasured(14.76e-6, 0.12e-6, 'A')).toBe('14.76 µA ± 0.12 µA');
    expect(formatQuantity(4.7e-9, 'F')).toBe('4.7 nF');
  });

  it('takes the prefix from the uncertainty when it is the larger, as for a level near zero, with one minus sign (U+2212)', () => {
    expect(formatMeasured(-52e-6, 1.753e-3, 'V')).toBe('\u22120.1 mV ± 1.8 mV');
  });

  it('shows a missing value as a dash, never as NaN or 0', () => {
    expect(formatMeasured(null, 0.1, 'V')).toBe('—');
    expect(formatQuantity(Number.NaN, 'V')).toBe('—');
  });

  it('writes limits as a spec would, with open sides, in the prefix of the value they bound', () => {
    expect(formatLimits(5.7, 6.3, 'V')).toBe('5.7 V … 6.3 V');
    expect(formatLimits(null, 1, '%')).toBe('≤ 1 %');
    expect(formatLimits(2051.1, null, 'Hz')).toBe('≥ 2 051.1 Hz');
    expect(formatLimits(19_500, 20_500, 'Hz', 0)).toBe('19 500 Hz … 20 500 Hz');
    expect(formatLimits(0.0057, 0.0063, 'V', 0)).toBe('0.0057 V … 0.0063 V');
  });

  it('signs every margin, in the prefix of its value (common practice, no source)', () => {
    expect(formatMargin(-0.0013, 'V', -3)).toBe('\u22121.3 mV');
    expect(formatMargin(0.42, 'Hz', 0)).toBe('+0.42 Hz');
  });

  it('writes a time in the given offset with the offset named, and UTC by name at offset zero', () => {
    // ISO 8601 offset arithmetic by hand: 09:15:30 UTC is 10:15 at +01:00, 04:15 at −05:00, 14:45 at +05:30.
    expect(formatTime('2026-03-02T10:15:30+01:00', 0)).toBe('2026-03-02 09:15 UTC');
    expect(formatTime('2026-03-02T10:15:30+01:00', 60)).toBe('2026-03-02 10:15 +01:00');
    expect(formatTime('2026-03-02T10:15:30+01:00', -300)).toBe('2026-03-02 04:15 -05:00');
    expect(formatTime('2026-03-02T10:15:30+01:00', 330)).toBe('2026-03-02 14:45 +05:30');
    // Across midnight the date moves with the clock.
    expect(formatTime('2026-03-02T23:30:00Z', 60)).toBe('2026-03-03 00:30 +01:00');
  });

  it('writes a time in the local zone by default, with the offset that zone had at that instant', () => {
    const iso = '2026-07-14T12:00:00Z';
    expect(formatTime(iso)).toBe(formatTime(iso, -new Date(iso).getTimezoneOffset()));
  });
});
