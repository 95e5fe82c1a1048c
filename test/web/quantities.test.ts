// The page's numbers go through the one formatter (src/types/quantityText.ts): SI prefixes after the
// SI Brochure, 9th ed. (2019), Table 7; digit groups of three and the minus sign U+2212 after its
// §5.4.4. The tick digits are the page's own rule: enough to tell neighbouring ticks apart.
import { describe, expect, it } from 'vitest';
import { axisTicks, countText, measurementLabel } from '../../web/src/quantities.js';

describe('the page quantities', () => {
  it('axisTicks writes every tick of an axis in the prefix of the largest, with its unit', () => {
    expect(axisTicks([0, 0.0005, 0.001, 0.0015], 's', 0.0005)).toEqual(['0 ms', '0.5 ms', '1 ms', '1.5 ms']);
    expect(axisTicks([0, 10_000, 20_000], 'Hz', 10_000)).toEqual(['0 kHz', '10 kHz', '20 kHz']);
  });

  it('axisTicks keeps ticks a sample apart distinct deep inside a long record', () => {
    expect(axisTicks([0.5000001, 0.5000002, 0.5000003], 's', 1e-7)).toEqual(['500.0001 ms', '500.0002 ms', '500.0003 ms']);
  });

  it('axisTicks writes levels in dB without a prefix and with the minus sign', () => {
    expect(axisTicks([-80, -40, 0], 'dB', 40)).toEqual(['\u221280 dB', '\u221240 dB', '0 dB']);
    expect(axisTicks([-2.5, 0, 2.5], 'V', 2.5)).toEqual(['\u22122.5 V', '0 V', '2.5 V']);
  });

  it('countText groups a count in threes and names come from the one label table', () => {
    expect(countText(10_000_000)).toBe('10 000 000');
    expect(countText(999)).toBe('999');
    expect(measurementLabel('highLevel')).toBe('high state level');
  });
});
