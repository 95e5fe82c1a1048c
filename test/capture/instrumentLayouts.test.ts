/**
 * The layouts bench instruments write, one trait at a time (issue 14), in files made here from the
 * FH-210 Kestrel demo scenario (ours): a ±3 V triangle at 261.63 Hz and a 0…10 V pulse, sampled at
 * 50 kS/s. Every file is written from the synthesizer's samples, so the expected values are the
 * samples as written (rounded to the digits printed), never the reader's own output.
 */
import { describe, expect, it } from 'vitest';
import { inspectCapture, readCapture } from '../../src/capture/index.js';
import { createStyle, renderInspectText } from '../../src/report/index.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import { isBenchError } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { tempFolder } from './tempFiles.js';

const writeFile = tempFolder();
/** Every file written here, with the options it is read with, for the `inspect` test at the end. */
const written: { path: string; options: Record<string, unknown> }[] = [];
const write = (name: string, text: string): string => {
  const path = writeFile(name, text);
  written.push({ path, options: {} });
  return path;
};
const DT = 2e-5;
const N = 2000;
const T0 = -0.01;
const tri = synthesize({ shape: 'triangle', frequency: 261.63, amplitude: 3, sampleRate: 1 / DT, samples: N, startTime: T0, seed: 14 }).values;
const pulse = synthesize({ shape: 'pulse', frequency: 261.63, amplitude: 5, sampleRate: 1 / DT, samples: N, startTime: T0, seed: 15 }).values;
const time = (i: number): number => T0 + i * DT;
const rows = (f: (i: number) => string, n = N): string[] => Array.from({ length: n }, (_, i) => f(i));

function maxError(read: Float64Array, written: ArrayLike<number>, from = 0): number {
  let m = 0;
  for (let i = 0; i < read.length; i++) m = Math.max(m, Math.abs(read[i] - written[i + from]));
  return m;
}

async function failure(path: string, options = {}): Promise<{ code: string; message: string }> {
  try {
    await readCapture(path, options);
  } catch (e) {
    if (isBenchError(e)) return { code: e.code, message: e.message };
    throw e;
  }
  throw new Error(`${path} was read without an error`);
}

describe('readCapture on what bench instruments write', () => {
  it('reads data rows whose first columns carry the preamble, with the time column not first and a trailing delimiter (trait 1)', async () => {
    const preamble: [string, string][] = [
      ['Record length', String(N)], ['Sampling interval', '2.000000E-05'], ['Trigger sample', '500'], ['Channel', 'CH1'],
      ['Vertical units', 'V'], ['Volts per division', '1.00E+00'], ['Probe factor', '1'], ['Horizontal units', 'S'],
    ];
    const text = rows((i) => `${preamble[i]?.[0] ?? ''},${preamble[i]?.[1] ?? ''},,${time(i).toExponential(6)},${tri[i].toFixed(3)},\n`).join('');
    const c = await readCapture(write('trait1.csv', text));
    expect(c.length).toBe(N);
    expect(c.layout.timeColumn).toBe(3);
    expect(c.channels.map((ch) => [ch.name, ch.unit])).toEqual([['ch1', 'V']]);
    expectWithin(c.sampleInterval, DT, { rel: 1e-9 }, 'as written');
    expectWithin(c.startTime, T0, { abs: 1e-12 }, 'as written');
    expectWithin(maxError(c.channels[0].samples, tri), 0, { abs: 5e-4 + 1e-12 }, 'three decimals written');
    expect(c.metadata).toMatchObject({ 'Record length': String(N), 'Vertical units': 'V' });
    expect(c.layout.reading?.sharedLines).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(c.warnings).toEqual([]);
  });

  it('takes start and increment from a header that names them column-wise above the values (trait 2)', async () => {
    const text = ['X,CH1,Start,Increment,', `Sequence,Volt,${T0.toExponential(3)},${DT.toExponential(3)},`, ...rows((i) => `${i},${tri[i].toFixed(4)},`)].join('\n');
    const c = await readCapture(write('trait2.csv', text));
    expect([c.layout.indexColumn, c.layout.timeColumn, c.layout.timing]).toEqual([0, null, 'metadata']);
    expect(c.channels.map((ch) => [ch.name, ch.unit])).toEqual([['CH1', 'V']]);
    expectWithin(c.sampleInterval, DT, { rel: 1e-12 }, 'Increment as written');
    expectWithin(c.startTime, T0, { abs: 1e-12 }, 'Start as written');
    expectWithin(maxError(c.channels[0].samples, tri), 0, { abs: 5e-5 + 1e-12 }, 'four decimals written');
    expect(c.layout.reading?.headerLines).toEqual([1, 2]);
  });

  it('reads two header rows, names over units, and a units-only row after a blank line (trait 3)', async () => {
    const two = ['Time,Triangle,Pulse', 'Second,Volt,Volt', ...rows((i) => `${time(i).toExponential(6)},${tri[i].toFixed(4)},${pulse[i].toFixed(4)}`)].join('\r\n');
    const a = await readCapture(write('trait3a.csv', two));
    expect(a.channels.map((ch) => [ch.name, ch.unit])).toEqual([['Triangle', 'V'], ['Pulse', 'V']]);
    expect([a.layout.headerLine, a.layout.reading?.unitsLine, a.layout.firstDataLine]).toEqual([1, 2, 3]);
    const unitsOnly = ['(ms)\t(V)\t(V)', '', ...rows((i) => `${(time(i) * 1e3).toFixed(5)}\t${(tri[i]).toFixed(4)}\t${pulse[i].toFixed(4)}`)].join('\n');
    const b = await readCapture(write('trait3b.txt', unitsOnly));
    expect(b.layout.delimiter).toBe('\t');
    expect(b.channels.map((ch) => [ch.name, ch.unit])).toEqual([['ch1', 'V'], ['ch2', 'V']]);
    expectWithin(b.sampleInterval, DT, { rel: 1e-9 }, 'time in ms as written');
    expectWithin(maxError(b.channels[1].samples, pulse), 0, { abs: 5e-5 + 1e-12 }, 'four decimals written');
  });

  const spellings: [string, string, number][] = [
    ['Time (s)', 'C1 in V', 1], ['t[ms]', 'CH1 / mV', 1e-3], ['Time in s', 'U / V', 1], ['Zeit / s', 'Kanal 1 (V)', 1],
    ['sec', 'Volts', 1], ['Time (uS)', 'CH1 (mV)', 1e-3], ['Time (mS)', 'CH1[V]', 1], ['Time [µs]', 'CH1 (μV)', 1e-6],
  ];
  for (const [timeCell, chCell, vScale] of spellings) {
    it(`reads units spelled "${timeCell}" and "${chCell}" (trait 4)`, async () => {
      const tUnit = /uS|µs/.test(timeCell) ? 1e-6 : /ms|mS/.test(timeCell) ? 1e-3 : 1;
      const text = [`${timeCell},${chCell}`, ...rows((i) => `${(time(i) / tUnit).toPrecision(10)},${(tri[i] / vScale).toPrecision(8)}`)].join('\n');
      const c = await readCapture(write(`units-${timeCell.replace(/\W/g, '')}-${chCell.replace(/\W/g, '')}.csv`, text));
      expect(c.layout.timeColumn).toBe(0);
      expect(c.channels[0].unit).toBe('V');
      expectWithin(c.sampleInterval, DT, { rel: 1e-8 }, 'as written');
      expectWithin(maxError(c.channels[0].samples, tri), 0, { abs: 3e-7 }, 'eight significant digits written');
    });
  }

  it('finds a time column named with another word, or with only a unit, because it rises on every row (trait 5)', async () => {
    const other = ['Punkt,Spannung (V)', ...rows((i) => `${time(i).toExponential(5)},${tri[i].toFixed(4)}`)].join('\n');
    const a = await readCapture(write('trait5a.csv', other));
    expect([a.layout.timeColumn, a.layout.reading?.xFoundBy]).toEqual([0, 'rising']);
    expectWithin(a.sampleInterval, DT, { rel: 1e-9 }, 'as written');
    const unitOnly = ['[s];[V]', ...rows((i) => `${time(i).toExponential(5).replace('.', ',')};${tri[i].toFixed(4).replace('.', ',')}`)].join('\n');
    const b = await readCapture(write('trait5b.csv', unitOnly));
    expect([b.layout.timeColumn, b.layout.decimalMark, b.channels[0].unit]).toEqual([0, ',', 'V']);
  });

  it('rebuilds a uniform time base from time stamps printed with too few digits, with a warning (trait 6)', async () => {
    // Printed to 0.1 ms while samples are 20 µs apart: each stamp appears five times.
    const text = ['Time (s),CH1 (V)', ...rows((i) => `${time(i).toFixed(4)},${tri[i].toFixed(4)}`)].join('\n');
    const c = await readCapture(write('trait6.csv', text));
    expect(c.length).toBe(N);
    expectWithin(c.sampleInterval, DT, { rel: 2e-4 }, 'least-squares slope of stamps rounded to 0.1 ms over 2000 rows');
    expect(c.warnings.map((w) => w.code)).toEqual(['time-rebuilt']);
    const stated = ['Sample interval,2e-5', 'Time (s),CH1 (V)', ...rows((i) => `${time(i).toFixed(4)},${tri[i].toFixed(4)}`)].join('\n');
    const d = await readCapture(write('trait6b.csv', stated));
    expectWithin(d.sampleInterval, DT, { rel: 1e-12 }, 'the preamble interval as written');
    expectWithin(d.startTime, T0, { abs: 5e-5 }, 'half the print resolution');
  });

  it('reads preamble values with channel prefixes, colons, tabs and units glued to the number (traits 4 and 7)', async () => {
    const text = ['Sample interval\t\t  :,CH1:0.00002', 'Points :,Analog:2000', 'Volts/div,200.0mV', 'Time per point,20.00uS', ...rows((i) => `${tri[i].toFixed(4)}`)].join('\n');
    const c = await readCapture(write('trait7.csv', text));
    expectWithin(c.sampleInterval, DT, { rel: 1e-12 }, 'CH1:0.00002 as written');
    expect(c.warnings).toEqual([]);
    expect(c.layout.reading?.recognised.map((r) => r.meaning)).toEqual(['sample interval (s)', 'record length (samples)', 'volts per division']);
  });

  it('marks raw converter codes as counts, never volts, and scales them when the preamble states the step (trait 8)', async () => {
    const codes = rows((i) => String(Math.round(tri[i] / 0.04)));
    const bare = await readCapture(write('trait8a.csv', ['Sampling period,2.0E-05', 'Volts per division,0.2', ...codes].join('\n')));
    expect(bare.channels[0].unit).toBe('counts');
    expect(bare.warnings.map((w) => w.code)).toEqual(['raw-counts']);
    expect(bare.warnings[0].message).toContain('only 0.2 V per division');
    const scaled = await readCapture(write('trait8b.csv', ['Sampling period,2.0E-05', 'Y increment,0.04', 'Y origin,0', 'Y reference,0', ...codes].join('\n')));
    expect(scaled.channels[0].unit).toBe('V');
    expectWithin(maxError(scaled.channels[0].samples, tri), 0, { abs: 0.02 + 1e-12 }, 'half a 40 mV step');
    const flagged = await readCapture(write('trait8c.csv', ['Sampling period,2.0E-05', ...codes].join('\n')), { scale: 0.04, channelUnit: 'V' });
    expectWithin(maxError(flagged.channels[0].samples, tri), 0, { abs: 0.02 + 1e-12 }, 'half a 40 mV step');
  });

  it('keeps the longer continuous part of a spliced record and reads past a cut-off last row and a checksum line (trait 9)', async () => {
    const spliced = rows((i) => `${time(i).toExponential(6)},${(i < 1700 ? tri[i] : tri[i - 900] + 0.4).toFixed(4)}`);
    const text = ['Time (s),CH1 (V)', ...spliced, `${time(N).toExponential(6)},`.slice(0, 8), 'checksum,0x3f2a'].join('\n');
    const c = await readCapture(write('trait9.csv', text));
    expect(c.length).toBe(1700);
    expect(c.warnings.map((w) => w.code)).toEqual(['footer', 'spliced']);
    expectWithin(maxError(c.channels[0].samples, tri), 0, { abs: 5e-5 + 1e-12 }, 'four decimals written');
  });

  it('keeps a dropout of many samples as a gap instead of interpolating across it (trait 9)', async () => {
    const kept = rows((i) => (i >= 1200 && i < 1260 ? '' : `${time(i).toExponential(6)},${tri[i].toFixed(4)}`)).filter((r) => r !== '');
    const c = await readCapture(write('dropout.csv', ['Time (s),CH1 (V)', ...kept].join('\n')));
    expect(c.length).toBe(N);
    expect(c.warnings.map((w) => w.code)).toEqual(['dropouts', 'resampled']);
    const missing = Array.from(c.channels[0].samples.subarray(1200, 1260)).filter(Number.isNaN).length;
    expect(missing).toBe(60);
    expectWithin(c.channels[0].samples[1260], tri[1260], { abs: 5e-5 + 1e-12 }, 'four decimals written');
  });

  it('reads the number spellings instruments print (trait 10)', async () => {
    const plus = ['Time (s);CH1 (V)', ...rows((i) => ` ${time(i) >= 0 ? '+' : ''}${time(i).toExponential(4).replace('.', ',').toUpperCase()};  ${tri[i] >= 0 ? '+' : '-'}0${Math.abs(tri[i]).toFixed(4).replace('.', ',')}`)].join('\n');
    const c = await readCapture(write('trait10.csv', plus));
    expect(c.layout.decimalMark).toBe(',');
    expectWithin(maxError(c.channels[0].samples, tri), 0, { abs: 5e-5 + 1e-12 }, 'four decimals written');
    expectWithin(c.sampleInterval, DT, { rel: 1e-9 }, 'as written');
  });

  it('reads a data logger file: tabs, decimal comma, BOM, CR CR LF, NAME= lines and jittered stamps resampled (trait 11)', async () => {
    const jitter = (i: number): number => (i % 7 === 3 ? 3e-6 : i % 5 === 1 ? -2e-6 : 0);
    const body = rows((i) => `${(time(i) + jitter(i)).toFixed(6).replace('.', ',')}\t${tri[i].toFixed(4).replace('.', ',')}`);
    const text = `\uFEFF${['LOGGER=bench logger', 'CHANNEL1=Triangle out', 'UNIT1=V', 'Time [s]\tTriangle out [V]', ...body].join('\r\r\n')}\r\r\n`;
    const c = await readCapture(write('trait11.txt', text));
    expect([c.layout.delimiter, c.layout.decimalMark, c.layout.bom, c.layout.resampled]).toEqual(['\t', ',', true, true]);
    expect(c.metadata).toMatchObject({ LOGGER: 'bench logger', UNIT1: 'V' });
    expect(c.warnings.map((w) => w.code)).toEqual(['resampled']);
    expectWithin(c.sampleInterval, DT, { rel: 1e-9 }, 'median step as written');
  });

  it('reads a logger that stamps rows with a date and a clock time, as seconds since the first stamp (trait 11)', async () => {
    // 5 ms steps printed to the millisecond: 12:00:00.000, 12:00:00.005, … across a minute's turn.
    const stamp = (i: number): string => {
      const ms = 59_000 + i * 5;
      return `01.03.2026 12:${String(Math.floor(ms / 60_000)).padStart(2, '0')}:${String(Math.floor((ms % 60_000) / 1000)).padStart(2, '0')},${String(ms % 1000).padStart(3, '0')}`;
    };
    const text = ['Logger;bench logger', 'Date and time;Triangle out (V)', ...rows((i) => `${stamp(i)};${tri[i].toFixed(4).replace('.', ',')}`, 600)].join('\r\n');
    const c = await readCapture(write('clock.csv', text));
    expect(c.warnings.map((w) => w.code)).toEqual(['clock-times']);
    expectWithin(c.sampleInterval, 5e-3, { rel: 1e-12 }, '5 ms stamps as written');
    expect(c.length).toBe(600);
    expectWithin(maxError(c.channels[0].samples, tri), 0, { abs: 5e-5 + 1e-12 }, 'four decimals written');
  });

  it('reads the first of several acquisitions and says how many there are; --segment picks another (trait 12)', async () => {
    const seg = rows((i) => `${time(i).toExponential(6)},${tri[i].toFixed(4)}`, 600);
    const text = ['Time (s),CH1 (V)', ...seg, ...seg.map((r) => r.replace(/,(.*)$/, (_, v: string) => `,${(Number(v) + 1).toFixed(4)}`)), ...seg].join('\n');
    const c = await readCapture(write('trait12a.csv', text));
    expect(c.length).toBe(600);
    expect(c.warnings.map((w) => w.code)).toEqual(['segments']);
    expect(c.layout.reading?.segments).toBe(3);
    const second = await readCapture(write('trait12b.csv', text), { segment: 2 });
    expectWithin(maxError(second.channels[0].samples, tri.map((v) => v + 1)), 0, { abs: 5e-5 + 1e-12 }, 'four decimals written, offset by 1 V');
    expect((await failure(write('trait12c.csv', text), { segment: 4 })).code).toBe('capture.unknown-segment');
  });

  it('takes a repeated header between acquisitions for a separator, not for text in the data (trait 12)', async () => {
    const seg = rows((i) => `${time(i).toExponential(6)},${tri[i].toFixed(4)}`, 500);
    const text = ['Time (s),CH1 (V)', ...seg, '', 'Time (s),CH1 (V)', ...seg, ''].join('\n');
    const c = await readCapture(write('frames.csv', text));
    expect([c.length, c.layout.reading?.segments]).toEqual([500, 2]);
    expect(c.warnings.map((w) => w.code)).toEqual(['segments']);
    // A title row followed by data whose time runs on is still refused.
    const runOn = ['Time (s),CH1 (V)', ...seg.slice(0, 50), 'Trigger re-armed,', ...rows((i) => `${time(i + 50).toExponential(6)},${tri[i + 50].toFixed(4)}`, 50)].join('\n');
    expect((await failure(write('run-on.csv', runOn))).code).toBe('capture.text-in-data');
  });

  it('reads a shorter channel with trailing empty cells and 0/1 logic columns without taking them for time or counts (trait 12)', async () => {
    const text = ['Time (s),CH1 (V),D0,D1', ...rows((i) => `${time(i).toExponential(6)},${i < 1500 ? tri[i].toFixed(4) : ''},${pulse[i] > 5 ? 1 : 0},${i % 2}`)].join('\n');
    const c = await readCapture(write('trait12d.csv', text));
    expect(c.channels.map((ch) => [ch.name, ch.unit, ch.invalidCount])).toEqual([['CH1', 'V', 500], ['D0', '', 0], ['D1', '', 0]]);
    expect(c.layout.timeColumn).toBe(0);
  });

  it('keeps the names of a header that names a channel the data does not hold (switched off)', async () => {
    const c = await readCapture(write('off.csv', ['Time (s),CH1 (V),CH2 (V)', ...rows((i) => `${time(i).toExponential(6)},${tri[i].toFixed(4)}`)].join('\n')));
    expect(c.channels.map((ch) => [ch.name, ch.unit])).toEqual([['CH1', 'V']]);
    expect(c.layout.timeColumn).toBe(0);
  });

  it('says that a spectrum export is a spectrum, not a waveform (trait 12)', async () => {
    const text = ['Frequency (Hz),Magnitude (dBV)', ...rows((i) => `${(i * 25).toFixed(1)},${(-60 - (i % 13)).toFixed(2)}`, 400)].join('\n');
    const f = await failure(write('spectrum.csv', text));
    expect(f.code).toBe('capture.spectrum-export');
    expect(f.message).toContain('not a waveform');
    // A frequency logged over time (a calibration sweep) is a channel, not a spectrum.
    const sweep = await readCapture(write('sweep.csv', ['Time (s),Frequency (Hz)', ...rows((i) => `${(i * 0.1).toFixed(1)},${(65.41 * 2 ** (i / 400)).toFixed(3)}`, 400)].join('\n')));
    expect(sweep.channels.map((ch) => [ch.name, ch.unit])).toEqual([['Frequency', 'Hz']]);
  });

  it('names the options that decide when the numbers read two ways, and follows them', async () => {
    const text = rows((i) => `${i},${Math.round(100 + 90 * Math.sin(i / 5))}`, 60).join('\n');
    const f = await failure(write('two-ways.csv', text));
    expect(f.code).toBe('capture.ambiguous-layout');
    expect(f.message).toContain('--delimiter comma --decimal point');
    const c = await readCapture(write('two-ways-b.csv', text), { delimiter: ',', decimalMark: '.', interval: DT });
    expect([c.layout.indexColumn, c.channels.length, c.layout.reading?.settings]).toEqual([0, 1, { delimiter: ',', decimalMark: '.', interval: DT }]);
  });

  it('follows --header-rows and --skip-rows over the reading it would choose', async () => {
    const text = ['Kestrel bench export', 'Triangle,Pulse', '(V),(V)', ...rows((i) => `${tri[i].toFixed(4)},${pulse[i].toFixed(4)}`, 50)].join('\n');
    const chosen = await readCapture(write('rows.csv', text), { interval: DT });
    expect(chosen.channels.map((ch) => [ch.name, ch.unit])).toEqual([['Triangle', 'V'], ['Pulse', 'V']]);
    const one = await readCapture(write('rows-1.csv', text), { interval: DT, headerRows: 1 });
    expect(one.channels.map((ch) => [ch.name, ch.unit])).toEqual([['ch1', 'V'], ['ch2', 'V']]);
    expect(one.metadata).toMatchObject({ Triangle: 'Pulse' });
    const skipped = await readCapture(write('rows-skip.csv', text), { interval: DT, skipRows: 2, headerRows: 0 });
    expect([skipped.layout.reading?.skippedLines, skipped.layout.headerLine, skipped.channels[0].unit]).toEqual([2, null, '']);
  });

  it('inspect explains every file above that reads: each line\'s role, the time base and the first samples', async () => {
    let explained = 0;
    for (const { path } of written) {
      const options = /trait8c|two-ways-b|rows/.test(path) ? { interval: DT, scale: 0.04, delimiter: ',' as const, decimalMark: '.' as const } : {};
      const doc = await inspectCapture(path, options).catch((e: unknown) => (isBenchError(e) ? null : Promise.reject(e)));
      if (doc === null) continue;
      explained++;
      expect(doc.lines.some((l) => l.role === 'data' || l.role === 'data and preamble')).toBe(true);
      expect(doc.firstRows.length).toBeGreaterThan(0);
      const text = renderInspectText([doc], createStyle(false));
      expect(text).toContain('time base');
      expect(text).toContain(`${doc.capture.length} samples`);
    }
    // Every file written above but the three refused on purpose: the spectrum, the numbers that read
    // two ways, and text in the data with the time running on.
    expect(explained).toBe(written.length - 3);
  });
});
