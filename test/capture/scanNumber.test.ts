import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { EMPTY, MARKER, NUMBER, NumberScanner, TEXT, parseNumberText } from '../../src/capture/scanNumber.js';
import { expectWithin } from '../helpers/expectWithin.js';

const bytes = (s: string): Buffer => Buffer.from(s, 'latin1');

function scan(text: string, mark = '.'): { value: number; kind: number; end: number; q: number } {
  const s = new NumberScanner(mark.charCodeAt(0));
  const value = s.scan(bytes(text), 0, text.length);
  return { value, kind: s.kind, end: s.end, q: s.quantumExp };
}

/** Object.is tells 0 from −0, which Number() also distinguishes. */
const same = (a: number, b: number): boolean => Object.is(a, b);

describe('NumberScanner', () => {
  it('reads every double printed by String() to exactly the value Number() reads (ECMA-262 Number::toString round trip)', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        const t = String(x);
        expect(same(scan(t).value, Number(t)), t).toBe(true);
      }),
      { numRuns: 3000 },
    );
  });

  it('reads %e- and %f-style text to exactly the value Number() reads, at any precision', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e30, max: 1e30, noNaN: true }), fc.integer({ min: 0, max: 20 }), (x, p) => {
        for (const t of [x.toExponential(p), x.toFixed(Math.min(p, 12)), x.toPrecision(p + 1)]) {
          expect(same(scan(t).value, Number(t)), t).toBe(true);
        }
      }),
      { numRuns: 2000 },
    );
  });

  it('reads arbitrary digit strings (long mantissas, large exponents) exactly as Number() does', () => {
    const digits = fc.string({ unit: fc.constantFrom(...'0123456789'), minLength: 1, maxLength: 25 });
    fc.assert(
      fc.property(fc.boolean(), digits, fc.option(digits), fc.option(fc.integer({ min: -400, max: 400 })), (neg, int, frac, exp) => {
        const t = `${neg ? '-' : ''}${int}${frac !== null ? `.${frac}` : ''}${exp !== null ? `e${exp}` : ''}`;
        const r = scan(t);
        expect(r.kind).toBe(NUMBER);
        expect(r.end).toBe(t.length);
        expect(same(r.value, Number(t)), t).toBe(true);
      }),
      { numRuns: 3000 },
    );
  });

  it('reads a decimal comma as the decimal mark when told to, and equals Number() on the dotted text', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: 0, max: 10 }), (x, p) => {
        const dotted = x.toExponential(p);
        expect(same(scan(dotted.replace('.', ','), ',').value, Number(dotted))).toBe(true);
      }),
    );
  });

  it('gives the decimal exponent of the last written digit as the print resolution', () => {
    expect(scan('-2.500000000e-02').q).toBe(-11);
    expect(scan('0.001').q).toBe(-3);
    expect(scan('1250').q).toBe(0);
    expect(scan('1.5E+03').q).toBe(2);
  });

  it('stops at the first byte that cannot continue a number and marks words as text', () => {
    const r = scan('1.5V');
    expectWithin(r.value, 1.5, { abs: 0 }, 'text as written');
    expect(r.end).toBe(3);
    expect(scan('abc').kind).toBe(TEXT);
    expect(scan('1e').kind).toBe(TEXT);
    expect(scan('-').kind).toBe(TEXT);
  });
});

describe('parseNumberText', () => {
  it('agrees with the byte scanner on value and resolution for numbers written either way', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e12, max: 1e12, noNaN: true }), fc.integer({ min: 0, max: 12 }), fc.boolean(), (x, p, comma) => {
        const t = comma ? x.toExponential(p).replace('.', ',') : x.toFixed(p);
        const mark = comma ? ',' : '.';
        const a = parseNumberText(t, mark);
        const b = scan(t, mark);
        expect(a.kind).toBe(NUMBER);
        expect(same(a.value, b.value), t).toBe(true);
        expect(a.quantumExp).toBe(b.q);
      }),
    );
  });

  it('sorts empty fields, NaN and infinity words, and other text into their kinds', () => {
    expect(parseNumberText('  ', '.').kind).toBe(EMPTY);
    expect(parseNumberText('""', '.').kind).toBe(EMPTY);
    for (const w of ['NaN', 'nan', '-inf', '+Infinity', 'INF']) expect(parseNumberText(w, '.').kind, w).toBe(MARKER);
    for (const w of ['CH1', '1.5V', '1,5', '12:30']) expect(parseNumberText(w, '.').kind, w).toBe(TEXT);
    expect(parseNumberText('1.5', ',').kind, 'a dot is text when the decimal mark is a comma').toBe(TEXT);
    expectWithin(parseNumberText('"2,5"', ',').value, 2.5, { abs: 0 }, 'text as written');
  });
});
