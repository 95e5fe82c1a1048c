import { describe, expect, it } from 'vitest';
import { synthesize, writeCsv, writeCsvChunks } from '../../src/syntheticCaptures/index.js';
import type { CsvChannel } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';

// A short ramp so every written value is easy to check by hand: 0, 0.25, 0.5 … V at 1 kHz (ours).
const ramp = { t0: -0.002, dt: 1e-3, values: Float64Array.from([0, 0.25, 0.5, 0.75]) };
const ch: CsvChannel[] = [{ name: 'CH1', unit: 'mV', signal: ramp }];

describe('writeCsv', () => {
  it('writes %e-style numbers with at least two exponent digits (C11 §7.21.6.1, the e conversion)', () => {
    const text = writeCsv(ch, { precision: 4 });
    expect(text.split('\n')[2]).toBe('-1.000e-03,2.500e+02');
    expect(writeCsv(ch, { precision: 3, upperCaseExponent: true }).split('\n')[1]).toBe('-2.00E-03,0.00E+00');
  });

  it('converts SI values to the written unit and labels the header in each unit style', () => {
    expect(writeCsv(ch, { format: 'fixed', precision: 1 }).split('\n').slice(0, 3)).toEqual(['Time (s),CH1 (mV)', '-0.0,0.0', '-0.0,250.0']);
    expect(writeCsv(ch, { unitStyle: 'brackets', timeName: 't', timeUnit: 'ms' }).split('\n')[0]).toBe('t[ms],CH1[mV]');
    expect(writeCsv(ch, { unitStyle: 'suffix', timeName: 'time' }).split('\n')[0]).toBe('time_s,CH1_mV');
    const ms = writeCsv(ch, { timeUnit: 'ms', format: 'shortest' }).split('\n')[1].split(',')[0];
    expectWithin(Number(ms), -2, { abs: 1e-12 }, 'ramp start −2 ms, written in ms');
  });

  it('writes decimal commas, semicolons, tabs, runs of spaces, quotes and trailing delimiters', () => {
    expect(writeCsv(ch, { delimiter: ';', decimalMark: ',', precision: 2 }).split('\n')[2]).toBe('-1,0e-03;2,5e+02');
    expect(writeCsv(ch, { delimiter: '\t', precision: 2 }).split('\n')[0]).toBe('Time (s)\tCH1 (mV)');
    expect(writeCsv(ch, { delimiter: ' ', spaceRun: 2, precision: 2 }).split('\n')[2]).toBe('-1.0e-03  2.5e+02');
    expect(writeCsv(ch, { quote: true, delimiter: ',', decimalMark: ',', precision: 2 }).split('\n')[2]).toBe('"-1,0e-03","2,5e+02"');
    expect(writeCsv(ch, { trailingDelimiter: true, precision: 2 }).split('\n')[2]).toBe('-1.0e-03,2.5e+02,');
  });

  it('writes a BOM, CRLF, a key,value preamble, an index or no x column, and a footer', () => {
    const text = writeCsv(ch, { bom: true, lineEnding: 'crlf', preamble: 'auto', xColumn: 'index', indexStart: 1, footer: 'end', format: 'shortest' });
    const lines = text.split('\r\n');
    expect(text.startsWith('\uFEFFsampling interval,0.001\r\n')).toBe(true);
    expect(lines.slice(1, 6)).toEqual(['vertical unit,mV', 'samples,4', 'first sample time,-0.002', 'Index,CH1 (mV)', '1,0']);
    expect(lines[lines.length - 2]).toBe('end');
    expect(writeCsv(ch, { xColumn: 'none', header: false, format: 'shortest' })).toBe('0\n250\n500\n750\n');
  });

  it('writes chosen rows only (an uneven time column) and replaces single samples with tokens', () => {
    const text = writeCsv(ch, { sampleIndices: [0, 1, 3], replace: [{ row: 1, channel: 0, text: '9.9E37' }], format: 'shortest' });
    expect(text.split('\n').slice(1, 4)).toEqual(['-0.002,0', '-0.001,9.9E37', '0.001,750']);
  });

  it('yields the same text in chunks as at once, for any chunk size', () => {
    const sig = synthesize({ shape: 'sine', frequency: 50, amplitude: 1, sampleRate: 1000, samples: 1000, noise: 0.1, seed: 2 });
    const channels = [{ name: 'a', unit: 'V', signal: sig }];
    const whole = writeCsv(channels, { preamble: 'auto', footer: 'done' });
    for (const rowsPerChunk of [1, 7, 999, 5000]) expect([...writeCsvChunks(channels, { preamble: 'auto', footer: 'done', rowsPerChunk })].join('')).toBe(whole);
  });

  it('refuses layouts it cannot write unambiguously, with RangeError', () => {
    expect(() => writeCsv(ch, { decimalMark: ',' })).toThrow(RangeError);
    expect(() => writeCsv([{ name: 'x', unit: 'furlong', signal: ramp }])).toThrow(RangeError);
    expect(() => writeCsv([...ch, { name: 'short', signal: { ...ramp, values: new Float64Array(2) } }])).toThrow(RangeError);
    expect(() => writeCsv([])).toThrow(RangeError);
  });
});
