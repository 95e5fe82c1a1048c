import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readCapture } from '../../src/capture/index.js';
import { tempFolder } from './tempFiles.js';

const write = tempFolder();

/** Object.is tells 0 from −0, which Number() also distinguishes. */
const sameArray = (a: Float64Array, b: Float64Array): boolean => a.length === b.length && a.every((v, i) => Object.is(v, b[i]));

/** Numbers as an export may print them: fixed, exponent, long mantissas, signs, a NaN now and then. */
const cell = fc.oneof(
  { weight: 6, arbitrary: fc.double({ min: -1e4, max: 1e4, noNaN: true }).chain((x) => fc.integer({ min: 0, max: 12 }).map((p) => x.toExponential(p))) },
  { weight: 3, arbitrary: fc.double({ min: -1e4, max: 1e4, noNaN: true }).chain((x) => fc.integer({ min: 0, max: 8 }).map((p) => x.toFixed(p))) },
  { weight: 1, arbitrary: fc.string({ unit: fc.constantFrom(...'0123456789'), minLength: 16, maxLength: 20 }) },
  { weight: 1, arbitrary: fc.constantFrom('NaN', '', '+7', '-0', '.5', '5.', '1e-30', '9.9E37') },
);

describe('byte scanner: plain rows and the general path', () => {
  it('readCapture reads the same samples from plain comma rows as from the same rows padded with blanks and quotes', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(fc.tuple(cell, cell), { minLength: 8, maxLength: 120 }), fc.integer({ min: 0, max: 1000 }), async (rows, seed) => {
        const lines = rows.map(([a, b], i) => `${i * 1e-6},${a},${b}`);
        // The padded file holds the same numbers, each row forced off the plain path in another way.
        const padded = lines.map((l, i) => (i % 3 === 0 ? l.replace(/,/g, ' , ') : i % 3 === 1 ? l.split(',').map((f) => `"${f}"`).join(',') : ` ${l}\t`));
        const plainPath = write(`plain-${seed}.csv`, `time,a,b\n${lines.join('\n')}\n`);
        const paddedPath = write(`padded-${seed}.csv`, `time,a,b\r\n${padded.join('\r\n')}\r\n`);
        const [p, q] = await Promise.all([readCapture(plainPath), readCapture(paddedPath)]);
        // Reference: the general row reader (blanks, quotes), against which the plain path is checked.
        expect(p.channels.length).toBe(2);
        for (let c = 0; c < 2; c++) {
          expect(sameArray(p.channels[c].samples, q.channels[c].samples), `channel ${c}`).toBe(true);
          expect(p.channels[c].invalidCount).toBe(q.channels[c].invalidCount);
        }
      }),
      { seed: 4180, numRuns: 60 },
    );
  });

  it('readCapture reads plain rows to the values Number() gives their text', async () => {
    const values = ['-2.500000000e-02', '1.23456789012345e+02', '7', '-0.000125', '3.5E-3', '12345678901234567890', '1e-30'];
    const text = `t,v\n${values.map((v, i) => `${i},${v}`).join('\n')}\n`;
    const cap = await readCapture(write('values.csv', text));
    // Reference: ECMAScript Number() on each field's text (ECMA-262 §7.1.4.1.1, StringToNumber).
    expect(Array.from(cap.channels[0].samples)).toEqual(values.map(Number));
  });
});
