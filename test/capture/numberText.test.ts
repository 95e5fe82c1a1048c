import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { NUMBER, TEXT, parseNumberText } from '../../src/capture/scanNumber.js';

/** Object.is tells 0 from −0, which Number() also distinguishes. */
const same = (a: number, b: number): boolean => Object.is(a, b);

const digits = fc.string({ unit: fc.constantFrom(...'0123456789'), minLength: 1, maxLength: 22 });

describe('parseNumberText on generated number texts', () => {
  it('parseNumberText reads any decimal text to exactly the value Number() reads and the resolution written, with either mark', () => {
    fc.assert(
      fc.property(
        fc.constantFrom('', '-', '+'),
        digits,
        fc.option(fc.string({ unit: fc.constantFrom(...'0123456789'), maxLength: 22 })),
        fc.option(fc.tuple(fc.constantFrom('e', 'E'), fc.constantFrom('', '-', '+'), fc.integer({ min: 0, max: 400 }))),
        fc.boolean(),
        (sign, int, frac, exp, comma) => {
          const mark = comma ? ',' : '.';
          const expText = exp === null ? '' : `${exp[0]}${exp[1]}${exp[2]}`;
          const text = `${sign}${int}${frac !== null ? `${mark}${frac}` : ''}${expText}`;
          const dotted = text.replace(',', '.');
          const r = parseNumberText(text, mark);
          expect(r.kind).toBe(NUMBER);
          // Reference: ECMAScript Number() on the dotted text (ECMA-262 §7.1.4.1.1, StringToNumber).
          expect(same(r.value, Number(dotted)), text).toBe(true);
          // Resolution: the exponent as written less the digits after the mark.
          const written = exp === null ? 0 : Number(`${exp[1]}${exp[2]}`);
          expect(r.quantumExp, text).toBe(written - (frac?.length ?? 0));
        },
      ),
      { seed: 1990, numRuns: 3000 },
    );
  });

  it('parseNumberText reads a number followed or preceded by anything else as text', () => {
    for (const t of ['1.5.2', '1e', '1e+', '--1', '1-', '.', '-.', 'e5', '1.5 V', '0x10', '1_000']) {
      expect(parseNumberText(t, '.').kind, t).toBe(TEXT);
    }
    for (const t of ['1,5,2', '1.5', '1,5e', ',']) expect(parseNumberText(t, ',').kind, t).toBe(TEXT);
  });
});
