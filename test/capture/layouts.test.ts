import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { readCapture } from '../../src/capture/index.js';
import { synthesize, writeCsv } from '../../src/syntheticCaptures/index.js';
import type { CsvChannel, CsvLayoutOptions } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { tempFolder } from './tempFiles.js';

const write = tempFolder();
const sha256 = (path: string): string => createHash('sha256').update(readFileSync(path)).digest('hex');
// FH-210 Kestrel at "mid": 261.63 Hz triangle of 6.0 Vpp and a 0…10 V pulse (demo scenario, ours).
const fs = 100_000;
const tri = synthesize({ shape: 'triangle', frequency: 261.63, amplitude: 3, sampleRate: fs, samples: 2000, startTime: -0.01, seed: 7 });
const pulse = synthesize({ shape: 'pulse', frequency: 261.63, amplitude: 5, sampleRate: fs, samples: 2000, startTime: -0.01, seed: 8 });
const channels: CsvChannel[] = [
  { name: 'CH1', unit: 'V', signal: tri },
  { name: 'CH2', unit: 'mV', signal: pulse },
];

function maxError(a: Float64Array, b: Float64Array): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

/** Largest difference between read and written samples, against the precision they were written with. */
function expectSamples(read: Float64Array, written: Float64Array, abs: number, source: string): void {
  expect(read.length).toBe(written.length);
  expectWithin(maxError(read, written), 0, { abs }, source);
}

async function roundTrip(name: string, layout: CsvLayoutOptions, options = {}) {
  const path = write(name, writeCsv(channels, layout));
  return readCapture(path, options);
}

const layouts: [string, CsvLayoutOptions][] = [
  ['comma, header with units in parentheses', {}],
  ['semicolon with decimal comma', { delimiter: ';', decimalMark: ',' }],
  ['tab with decimal comma', { delimiter: '\t', decimalMark: ',' }],
  ['runs of spaces', { delimiter: ' ', spaceRun: 4 }],
  ['CRLF line ends and a BOM', { lineEnding: 'crlf', bom: true }],
  ['units in brackets and time in ms', { unitStyle: 'brackets', timeName: 't', timeUnit: 'ms' }],
  ['unit suffixes and time in µs', { unitStyle: 'suffix', timeName: 'time', timeUnit: 'µs' }],
  ['every field quoted', { quote: true }],
  ['a trailing delimiter on every row', { trailingDelimiter: true }],
  ['fixed-point numbers', { format: 'fixed', precision: 7 }],
  ['a preamble and upper-case exponents', { preamble: 'auto', upperCaseExponent: true }],
];

describe('readCapture on layouts written by writeCsv', () => {
  for (const [label, layout] of layouts) {
    it(`recovers samples, interval and start time from ${label}`, async () => {
      const c = await roundTrip(`${label.replace(/\W+/g, '_')}.csv`, layout);
      expect(c.channels.map((ch) => ch.name)).toEqual(['CH1', 'CH2']);
      expect(c.length).toBe(2000);
      // Half a unit in the last written digit: 9 significant digits of ≤ 3 V (or ≤ 10 000 mV), or 7 decimals.
      const fixed = layout.format === 'fixed';
      expectSamples(c.channels[0].samples, tri.values, fixed ? 0.5e-7 : 0.5e-8 * 3, 'rounding to the written precision');
      expectSamples(c.channels[1].samples, pulse.values, fixed ? 0.5e-10 : 0.5e-8 * 10, 'rounding to the written precision (mV)');
      expectWithin(c.sampleInterval, 1 / fs, { rel: 1e-6 }, 'synthesizer sample rate 100 kHz');
      expectWithin(c.startTime, -0.01, { abs: 1e-9 }, 'synthesizer start time');
      expect(c.channels[1].unit).toBe('V');
      expect(c.layout.resampled).toBe(false);
      expect(c.warnings).toEqual([]);
    });
  }

  it('reports the layout it found: delimiter, decimal mark, header line, units, line ending and BOM', async () => {
    const c = await roundTrip('report.csv', { delimiter: ';', decimalMark: ',', lineEnding: 'crlf', bom: true, preamble: 'auto' });
    expect(c.layout).toMatchObject({ delimiter: ';', decimalMark: ',', headerLine: 5, firstDataLine: 6, lastDataLine: 2005, lineEnding: 'crlf', bom: true, timeColumn: 0, timing: 'time-column' });
    expect(c.layout.columns.map((col) => [col.name, col.unit, col.siUnit])).toEqual([['Time', 's', 's'], ['CH1', 'V', 'V'], ['CH2', 'mV', 'V']]);
    expect(c.channels[1].displayUnit).toBe('mV');
    expect(c.metadata['sampling interval']).toBe('1,00000000e-05');
  });

  it('takes the interval from the preamble when there is no time column', async () => {
    const c = await roundTrip('no_x.csv', { xColumn: 'none', preamble: 'auto' });
    expect(c.layout.timing).toBe('metadata');
    expectWithin(c.sampleInterval, 1 / fs, { rel: 1e-8 }, 'preamble as written by writeCsv');
    expectWithin(c.startTime, -0.01, { abs: 1e-12 }, 'preamble first sample time');
  });

  it('takes the interval from --sample-rate for an index column without metadata', async () => {
    const c = await roundTrip('index.csv', { xColumn: 'index', indexStart: 1 }, { sampleRate: fs });
    expect(c.layout.indexColumn).toBe(0);
    expect(c.layout.timing).toBe('option');
    expectWithin(c.sampleInterval, 1 / fs, { rel: 1e-12 }, 'the flag');
  });

  it('names headerless channels ch1…chN and finds the time column because it rises on every row', async () => {
    const c = await roundTrip('noheader.csv', { header: false });
    expect(c.layout.headerLine).toBeNull();
    expect(c.layout.timeColumn).toBe(0);
    expect(c.channels.map((ch) => ch.name)).toEqual(['ch1', 'ch2']);
  });

  it('keeps only the channel --channel names, by name or by 1-based number', async () => {
    const byName = await roundTrip('sel1.csv', {}, { channel: 'ch2' });
    expect(byName.channels.map((ch) => ch.name)).toEqual(['CH2']);
    const byNumber = await roundTrip('sel2.csv', {}, { channel: '1' });
    expect(byNumber.channels.map((ch) => ch.name)).toEqual(['CH1']);
    expectSamples(byNumber.channels[0].samples, tri.values, 1.5e-8, 'rounding to 9 significant digits');
  });
});

describe('readCapture round trip (fast-check)', () => {
  const layoutArb = fc.record({
    delimiter: fc.constantFrom<',' | ';' | '\t' | ' '>(',', ';', '\t', ' '),
    comma: fc.boolean(),
    header: fc.boolean(),
    unitStyle: fc.constantFrom<'parens' | 'brackets' | 'suffix' | 'none'>('parens', 'brackets', 'suffix', 'none'),
    lineEnding: fc.constantFrom<'lf' | 'crlf'>('lf', 'crlf'),
    bom: fc.boolean(),
    preamble: fc.boolean(),
    precision: fc.integer({ min: 6, max: 15 }),
    unitRow: fc.constantFrom<'words' | 'brackets' | undefined>(undefined, 'words', 'brackets'),
    preambleBeside: fc.boolean(),
    plusSign: fc.boolean(),
    xColumn: fc.constantFrom<'time' | 'index' | 'none'>('time', 'index', 'none'),
    quote: fc.boolean(),
    trailingDelimiter: fc.boolean(),
    format: fc.constantFrom<'exponential' | 'fixed' | 'shortest'>('exponential', 'fixed', 'shortest'),
    rows: fc.integer({ min: 3, max: 300 }),
    amplitude: fc.double({ min: 1e-3, max: 1e3, noNaN: true }),
    seed: fc.integer({ min: 1, max: 1000 }),
  });

  it('preserves every sample to the written precision across random layouts and leaves the file unchanged', async () => {
    let k = 0;
    await fc.assert(
      fc.asyncProperty(layoutArb, async (l) => {
        // Without a time column, a few noisy rows could rise by chance like one: at least 16 rows then.
        const rows = l.xColumn === 'time' ? l.rows : Math.max(16, l.rows);
        const sig = synthesize({ shape: 'sine', frequency: 50, amplitude: l.amplitude, sampleRate: 10_000, samples: rows, noise: l.amplitude / 10, seed: l.seed });
        const decimalMark = l.comma && (l.delimiter !== ',' || l.quote) ? ',' : '.';
        const text = writeCsv([{ name: 'probe', unit: 'V', signal: sig }, { name: 'ref', unit: 'mV', signal: sig }], {
          delimiter: l.delimiter, decimalMark, header: l.header, unitStyle: l.unitStyle, lineEnding: l.lineEnding,
          bom: l.bom, preamble: l.preamble ? 'auto' : undefined, precision: l.precision,
          unitRow: l.unitRow, plusSign: l.plusSign, xColumn: l.xColumn, quote: l.quote && l.delimiter !== ' ', format: l.format,
          trailingDelimiter: l.trailingDelimiter && l.delimiter !== ' ',
          // The preamble beside the data needs rows enough for its time column (not first) to show that it rises, and a delimiter that is not a run of spaces.
          preambleBeside: l.preambleBeside && l.preamble && rows >= 16 && l.delimiter !== ' ',
        });
        const path = write(`prop${k++}.csv`, text);
        const before = sha256(path);
        // A file with no time column and no preamble states no rate: the user gives it.
        const c = await readCapture(path, l.xColumn !== 'time' && !l.preamble ? { sampleRate: 10_000 } : {});
        // The input is never modified, and the digest is of the stored bytes.
        expect([sha256(path), c.sha256]).toEqual([before, before]);
        const peak = l.amplitude * 2;
        // Half a unit in the last digit written: relative for %e, absolute for %f, none for the shortest text.
        // (plus a few units in the last place of the double for the mV → V product).
        const tol = (scale: number): number => (l.format === 'shortest' ? 1e-12 * peak : l.format === 'fixed' ? 0.51 * 10 ** -l.precision * scale + 4 * Number.EPSILON * peak : peak * 10 ** (1 - l.precision));
        expectSamples(c.channels[0].samples, sig.values, tol(1), 'rounding to the written precision');
        expectWithin(c.sampleInterval, 1e-4, { rel: 1e-6 }, 'synthesizer rate 10 kHz');
        const unitsInHeader = l.header && (l.unitStyle !== 'none' || l.unitRow !== undefined);
        expect(c.channels[1].unit).toBe(unitsInHeader || l.preamble ? 'V' : '');
        if (unitsInHeader) expectSamples(c.channels[1].samples, sig.values, tol(1e-3), 'mV written, V read');
      }),
      { seed: 1407, numRuns: 120 },
    );
  });

  it('rebuilds the time base of a time column printed with too few digits, for any layout', async () => {
    let k = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.record({
          delimiter: fc.constantFrom<',' | ';' | '\t' | ' '>(',', ';', '\t', ' '),
          header: fc.boolean(),
          decimals: fc.constantFrom(2, 3),
          rows: fc.integer({ min: 200, max: 3000 }),
          seed: fc.integer({ min: 1, max: 1000 }),
        }),
        async (l) => {
          // Stamps 10 or 100 samples apart (0.001 or 0.01 s printed, 0.1 ms steps); a column with no
          // name is taken for time only up to 64 rows per stamp.
          const decimals = l.header ? l.decimals : 3;
          const sig = synthesize({ shape: 'triangle', frequency: 50, amplitude: 1, sampleRate: 10_000, samples: l.rows, noise: 0.01, seed: l.seed });
          const c = await readCapture(write(`coarse${k++}.csv`, writeCsv([{ name: 'probe', unit: 'V', signal: sig }], { delimiter: l.delimiter, header: l.header, timeDecimals: decimals })));
          expect(c.warnings.map((w) => w.code)).toContain('time-rebuilt');
          expect(c.length).toBe(l.rows);
          // Least-squares slope of stamps rounded to q (error spread q/√12) over n rows: standard
          // error (q/√12)/√(n³/12) (closed form for a straight-line fit); four of them allowed.
          const q = 10 ** -decimals;
          expectWithin(c.sampleInterval, 1e-4, { abs: (4 * (q / Math.sqrt(12))) / Math.sqrt(l.rows ** 3 / 12) }, 'synthesizer rate 10 kHz');
          expectSamples(c.channels[0].samples, sig.values, 1.5e-8, 'nine significant digits written');
        },
      ),
      { seed: 1408, numRuns: 30 },
    );
  });
});
