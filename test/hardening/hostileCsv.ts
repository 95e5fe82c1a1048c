/**
 * fast-check arbitraries for capture files as a bench meets them: any delimiter and decimal mark,
 * preambles and junk lines, mixed line endings, text and overflow markers among the numbers — and
 * then damaged: cut at any byte, invalid UTF-8, stray control bytes, very long lines, very wide rows.
 * Sizes stay small so that hundreds of files are read in a few seconds.
 */
import fc from 'fast-check';

const DELIMITERS = [',', ';', '\t', ' ', '|'] as const;
const ENDINGS = ['\n', '\r\n', '\r'] as const;
const NAMES = ['Time (s)', 'TIME', 't/ms', 'Sample', 'CH1 (V)', 'CH2 (mV)', 'µs', '"Ch, 1"', 'Kanal 1 [V]', 'ñ', '', '#', 'nan'] as const;
const WORDS = ['nan', 'NaN', '-inf', 'Infinity', '9.9E37', '9.91e37', '', '---', 'clip', '"1.5"', '1.5V', '12:30', '1e400', '-0', '0x1F', '1,234.5'] as const;

export interface CsvLayout {
  readonly delimiter: string;
  readonly decimal: '.' | ',';
  readonly ending: readonly string[];
  readonly header: readonly string[] | null;
  readonly preamble: readonly string[];
  readonly rows: readonly (readonly string[])[];
}

const numberText = (decimal: '.' | ','): fc.Arbitrary<string> =>
  fc
    .oneof(
      { weight: 6, arbitrary: fc.double({ min: -20, max: 20, noNaN: true }).map((v) => v.toPrecision(6)) },
      { weight: 2, arbitrary: fc.double({ noNaN: true, noDefaultInfinity: true }).map((v) => v.toExponential(4)) },
      { weight: 2, arbitrary: fc.integer({ min: -100000, max: 100000 }).map(String) },
      { weight: 1, arbitrary: fc.constantFrom(...WORDS) },
    )
    .map((s) => (decimal === ',' ? s.replace('.', ',') : s));

/** A time column: uniform, jittered, repeated or stepping backwards now and then. */
const timeColumn = (n: number, decimal: '.' | ','): fc.Arbitrary<string[]> =>
  fc
    .record({
      t0: fc.double({ min: -1, max: 1, noNaN: true }),
      dt: fc.constantFrom(1e-15, 1e-9, 1e-6, 2.5e-5, 1e-3, 1),
      jitter: fc.constantFrom(0, 0, 0, 0.3, 2),
      seed: fc.integer({ min: 0, max: 1 << 30 }),
    })
    .map(({ t0, dt, jitter, seed }) => {
      let s = seed;
      const next = (): number => ((s = (s * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff) - 0.5;
      return Array.from({ length: n }, (_, i) => {
        const t = t0 + (i + jitter * next()) * dt;
        const text = t.toPrecision(jitter === 0 ? 9 : 4);
        return decimal === ',' ? text.replace('.', ',') : text;
      });
    });

export const csvLayout: fc.Arbitrary<CsvLayout> = fc
  .record({
    delimiter: fc.constantFrom(...DELIMITERS),
    decimal: fc.constantFrom<'.' | ','>('.', ','),
    endings: fc.array(fc.constantFrom(...ENDINGS), { minLength: 1, maxLength: 3 }),
    columns: fc.integer({ min: 1, max: 5 }),
    rows: fc.integer({ min: 0, max: 260 }),
    header: fc.boolean(),
    preamble: fc.array(fc.oneof(fc.constantFrom('Sample Interval,1e-6', 'Record Length,2000', 'Vertical Units,mV', 'Model: FH-SCOPE', '# exported', 'Vertical Scale,500mV/div', 'Vertical divisions,8', 'CH1 Offset,-1.5 V', 'Probe,10X', 'Input range,±10 V', 'Range,-5 V to 5 V', 'Source,CH2', 'Volts/div,1.0,0.5,2', 'Position,CH1:1.5 div', 'Full scale,0 V to 0 V', 'Divisions,1e308', 'Volts/div,1e308'), fc.string({ maxLength: 30 })), { maxLength: 5 }),
  })
  .chain((p) =>
    fc
      .tuple(
        timeColumn(p.rows, p.decimal),
        fc.array(fc.array(numberText(p.decimal), { minLength: p.columns - 1, maxLength: p.columns - 1 }), { minLength: p.rows, maxLength: p.rows }),
        fc.array(fc.constantFrom(...NAMES), { minLength: p.columns, maxLength: p.columns }),
        fc.boolean(),
      )
      .map(([times, values, names, withTime]) => ({
        delimiter: p.delimiter,
        decimal: p.decimal,
        ending: p.endings,
        header: p.header ? names : null,
        preamble: p.preamble,
        rows: values.map((v, i) => (withTime ? [times[i], ...v] : [String(i), ...v])),
      })),
  );

export function layoutText(l: CsvLayout): string {
  const lines = [...l.preamble, ...(l.header ? [l.header.join(l.delimiter)] : []), ...l.rows.map((r) => r.join(l.delimiter))];
  return lines.map((line, i) => line + l.ending[i % l.ending.length]).join('');
}

/** One kind of damage to a file's bytes; positions are fractions of the length so they shrink well. */
export type Damage =
  | { readonly kind: 'cut'; readonly at: number }
  | { readonly kind: 'insert'; readonly at: number; readonly bytes: readonly number[] }
  | { readonly kind: 'long-line'; readonly at: number; readonly length: number }
  | { readonly kind: 'wide-row'; readonly at: number; readonly fields: number }
  | { readonly kind: 'repeat'; readonly at: number; readonly length: number; readonly times: number }
  | { readonly kind: 'drop'; readonly at: number; readonly length: number };

const at = fc.double({ min: 0, max: 1, noNaN: true });
const strayBytes = fc.oneof(
  fc.constantFrom([0xff], [0xc3], [0xc3, 0x28], [0xe2, 0x82], [0xed, 0xa0, 0x80], [0x00], [0x1b, 0x5b], [0xef, 0xbb, 0xbf], [0xff, 0xfe], [0x22], [0x0d], [0x0a, 0x0a]),
  fc.array(fc.integer({ min: 0, max: 255 }), { minLength: 1, maxLength: 8 }),
);

export const damage = (maxLine: number): fc.Arbitrary<Damage> =>
  fc.oneof(
    { weight: 4, arbitrary: fc.record({ kind: fc.constant('cut' as const), at }) },
    { weight: 4, arbitrary: fc.record({ kind: fc.constant('insert' as const), at, bytes: strayBytes }) },
    { weight: 1, arbitrary: fc.record({ kind: fc.constant('long-line' as const), at, length: fc.integer({ min: 1000, max: maxLine }) }) },
    { weight: 1, arbitrary: fc.record({ kind: fc.constant('wide-row' as const), at, fields: fc.integer({ min: 100, max: 3000 }) }) },
    { weight: 2, arbitrary: fc.record({ kind: fc.constant('repeat' as const), at, length: fc.integer({ min: 1, max: 400 }), times: fc.integer({ min: 1, max: 20 }) }) },
    { weight: 2, arbitrary: fc.record({ kind: fc.constant('drop' as const), at, length: fc.integer({ min: 1, max: 400 }) }) },
  );

export function applyDamage(bytes: Buffer, d: Damage): Buffer {
  const p = Math.floor(d.at * bytes.length);
  switch (d.kind) {
    case 'cut':
      return bytes.subarray(0, p);
    case 'insert':
      return Buffer.concat([bytes.subarray(0, p), Buffer.from(d.bytes), bytes.subarray(p)]);
    case 'long-line':
      return Buffer.concat([bytes.subarray(0, p), Buffer.alloc(d.length, '1.25,'), Buffer.from('\n'), bytes.subarray(p)]);
    case 'wide-row':
      return Buffer.concat([bytes.subarray(0, p), Buffer.from(`\n${Array.from({ length: d.fields }, (_, i) => i % 7).join(',')}\n`), bytes.subarray(p)]);
    case 'repeat': {
      const piece = bytes.subarray(p, p + d.length);
      return Buffer.concat([bytes.subarray(0, p), ...Array.from({ length: d.times }, () => piece), bytes.subarray(p)]);
    }
    case 'drop':
      return Buffer.concat([bytes.subarray(0, p), bytes.subarray(p + d.length)]);
  }
}

export function describeDamage(d: Damage): string {
  return `${d.kind}@${d.at.toFixed(3)}`;
}
