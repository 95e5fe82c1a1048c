/**
 * Hand-made captures in test/fixtures/capture (FH-210 Kestrel demo scenario, ours): values expected
 * here are read off the fixture text itself ("as written") or follow from how it was made.
 */
import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { measureCapture } from '../../src/analysis/index.js';
import { readCapture } from '../../src/capture/index.js';
import { expectWithin } from '../helpers/expectWithin.js';

const fixture = (name: string): string => fileURLToPath(new URL(`../fixtures/capture/${name}`, import.meta.url));

/** The FH-210 core's triangle: ±3 V at 261.63 Hz, starting at −3 V at t = 0 (how the fixtures were made). */
function kestrelTriangle(t: number): number {
  const p = (((t * 261.63) % 1) + 1) % 1;
  return p < 0.5 ? -3 + 12 * p : 3 - 12 * (p - 0.5);
}

describe('readCapture on hand-made fixtures', () => {
  it('reads a European scope export: semicolons, decimal comma, CRLF, preamble, mV column', async () => {
    const c = await readCapture(fixture('eu_scope_semicolon.csv'));
    expect(c.layout).toMatchObject({ delimiter: ';', decimalMark: ',', headerLine: 8, firstDataLine: 9, lineEnding: 'crlf', timing: 'time-column' });
    expect(c.metadata).toMatchObject({ Unit: 'FK-0101', 'Sampling interval': '2,000000E-05', 'Vertical unit': 'V' });
    expect(c.channels.map((ch) => [ch.name, ch.unit, ch.displayUnit])).toEqual([['Triangle', 'V', 'mV'], ['Pulse', 'V', 'V']]);
    expectWithin(c.sampleInterval, 2e-5, { rel: 1e-9 }, 'fixture time column and preamble, as written');
    expectWithin(c.startTime, -8e-4, { abs: 1e-15 }, 'fixture line 9, as written');
    expectWithin(c.channels[0].samples[0], -0.4884, { abs: 1e-15 }, 'fixture line 9: -488,4 mV');
    expectWithin(c.channels[1].samples[79], 10, { abs: 0 }, 'fixture line 88: 10,00 V');
    expect(c.warnings).toEqual([]);
  });

  it('resamples a simulator’s whitespace output with uneven steps and reproduces the triangle between them', async () => {
    const c = await readCapture(fixture('sim_kestrel_tran.txt'));
    expect(c.layout.delimiter).toBe(' ');
    expect(c.layout.resampled).toBe(true);
    expect(c.warnings.map((w) => w.code)).toEqual(['resampled']);
    expect(c.channels[0].name).toBe('V(tri)');
    expect(c.channels[0].unit).toBe('V');
    // The steps cycle through 5, 12, 31, 20, 8, 40 and 17 µs (fixture construction); the median of
    // the steps as written is 17 µs, up to the extra corner breakpoints.
    expectWithin(c.sampleInterval, 17e-6, { rel: 0.2 }, 'median of the fixture steps');
    // The simulator put breakpoints at the corners, so the triangle is linear between samples and
    // linear interpolation reproduces it exactly (closed form), up to the printed digits: corner times
    // were rounded to 1 ps, which at the ramp slope of 12 V·261.63 Hz ≈ 3.1 kV/s is ≈ 3 nV.
    let worst = 0;
    c.channels[0].samples.forEach((v, i) => (worst = Math.max(worst, Math.abs(v - kestrelTriangle(c.startTime + i * c.sampleInterval)))));
    expectWithin(worst, 0, { abs: 5e-9 }, 'closed-form triangle');
  });

  it('reads a logger’s index column with its rate from a "# sample rate = 2 kHz" line', async () => {
    const c = await readCapture(fixture('logger_index.csv'));
    expect(c.layout).toMatchObject({ indexColumn: 0, timeColumn: null, timing: 'metadata', headerLine: 4 });
    expectWithin(c.sampleInterval, 1 / 2000, { rel: 1e-12 }, 'fixture line 2: 2 kHz');
    expect(c.channels[0].name).toBe('Triangle out');
    expect(c.length).toBe(40);
  });

  it('counts overflow markers, NaN, empty fields and infinities per channel as NaN with the first line', async () => {
    const c = await readCapture(fixture('overflow_markers.csv'));
    const [ch1, ch2] = c.channels;
    expect([ch1.invalidCount, ch1.firstInvalidLine, ch2.invalidCount, ch2.firstInvalidLine]).toEqual([3, 9, 2, 15]);
    expect(Number.isNaN(ch1.samples[7]) && Number.isNaN(ch1.samples[12]) && Number.isNaN(ch2.samples[13])).toBe(true);
    expect(ch1.samples.filter((v) => v === 0).length).toBe(0);
    expect(c.warnings.filter((w) => w.code === 'invalid-samples').map((w) => [w.channel, w.line])).toEqual([['CH1', 9], ['CH2', 15]]);
  });

  it('reads the flat top of an 8-bit triangle as it is, leaving the judgement to the analysis, which finds it on the top only', async () => {
    const c = await readCapture(fixture('clipped_triangle.csv'));
    expect(c.warnings).toEqual([]);
    const tops = measureCapture(c).channels[0].flatTops ?? [];
    expect(tops.map((t) => t.side)).toEqual(['high']);
    // Two peaks in the 8 ms record (at T/2 and 3T/2). Codes that round to ≥ 2.55 V start at 32.5 LSB
    // = 2.539 V, so each peak spends 2·(3 − 2.539 V)/(3139.6 V/s) = 294 µs = 14.7 samples pinned (closed form).
    expectWithin(tops[0].samples, 29.4, { abs: 2 }, 'closed form: time a triangle spends above a level');
  });

  it('ignores a footer line after the data with a warning naming it', async () => {
    const c = await readCapture(fixture('footer.csv'));
    expect(c.length).toBe(25);
    expect(c.warnings).toEqual([{ code: 'footer', line: 27, message: 'line 27 ("End of record,25 points") after the data was not read as samples' }]);
  });

  it('reads a .csv.gz transparently, hashing the stored (compressed) bytes', async () => {
    const plain = await readCapture(fixture('kestrel_mid.csv'));
    const gz = await readCapture(fixture('kestrel_mid.csv.gz'));
    expect(gz.layout.compressed).toBe(true);
    expect(gz.sha256).not.toBe(plain.sha256);
    expect(gz.size).toBeLessThan(plain.size);
    expect(Array.from(gz.channels[1].samples)).toEqual(Array.from(plain.channels[1].samples));
  });

  it('reads quoted fields holding a decimal comma in a comma-separated file (papaparse path)', async () => {
    const c = await readCapture(fixture('quoted_decimal_comma.csv'));
    expect(c.layout).toMatchObject({ delimiter: ',', decimalMark: ',', headerLine: 1 });
    expect(c.length).toBe(20);
    expectWithin(c.sampleInterval, 1e-5, { rel: 1e-9 }, 'fixture time column, as written');
    expectWithin(c.channels[0].samples[0], -3, { abs: 0 }, 'fixture line 2: "-3,0000"');
  });
});
