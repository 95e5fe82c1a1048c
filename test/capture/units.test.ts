import { describe, expect, it } from 'vitest';
import { readMetadata } from '../../src/capture/metadata.js';
import { parseHeaderCell, parseUnit } from '../../src/capture/siUnits.js';
import { readCapture } from '../../src/capture/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { tempFolder } from './tempFiles.js';

const write = tempFolder();

describe('parseHeaderCell and parseUnit', () => {
  // Prefix factors from the SI Brochure, 9th ed. (2019), Table 7.
  const cases: [string, string, string, number, string][] = [
    ['Time (s)', 'Time', 's', 1, 's'],
    ['t[ms]', 't', 'ms', 1e-3, 's'],
    ['t [µs]', 't', 'µs', 1e-6, 's'],
    ['time_us', 'time', 'us', 1e-6, 's'],
    ['Time (ns)', 'Time', 'ns', 1e-9, 's'],
    ['CH1 (mV)', 'CH1', 'mV', 1e-3, 'V'],
    ['CH2 [V]', 'CH2', 'V', 1, 'V'],
    ['probe (µV)', 'probe', 'µV', 1e-6, 'V'],
    ['ch1_mv', 'ch1', 'mv', 1e-3, 'V'],
    ['Supply current (A)', 'Supply current', 'A', 1, 'A'],
    ['I(R4) (mA)', 'I(R4)', 'mA', 1e-3, 'A'],
    ['CH1 / V', 'CH1', 'V', 1, 'V'],
  ];
  for (const [cell, name, unit, scale, si] of cases) {
    it(`reads "${cell}" as ${name} in ${unit} (× ${scale} to ${si})`, () => {
      expect(parseHeaderCell(cell)).toEqual({ name, unit });
      const info = parseUnit(unit);
      expect(info?.siUnit).toBe(si);
      expectWithin(info?.scale, scale, { rel: 1e-15 }, 'SI Brochure 9th ed. Table 7 (prefixes)');
    });
  }

  it('keeps non-unit brackets in the name and reads simulator probes V(node) as volts', () => {
    expect(parseHeaderCell('Voltage (CH1)')).toEqual({ name: 'Voltage (CH1)', unit: '' });
    expect(parseHeaderCell('V(tri)')).toEqual({ name: 'V(tri)', unit: 'V' });
    expect(parseUnit('MV')).toEqual({ scale: 1e6, siUnit: 'V' });
    expect(parseUnit('furlong')).toBeNull();
  });
});

describe('readMetadata', () => {
  it('finds interval, rate, unit, length and start time under general wordings, with units in key or value', () => {
    const m = readMetadata([['Sample interval (us)', '20'], ['vertical units', 'mV'], ['Number of points', '2500'], ['Start time', '-1 ms']], '.');
    expectWithin(m.interval?.value, 20e-6, { rel: 1e-12 }, 'the key unit, as written');
    expect([m.verticalUnit, m.recordLength]).toEqual(['mV', 2500]);
    expectWithin(m.startTime, -1e-3, { rel: 1e-12 }, 'as written');
    const rate = readMetadata([['Sampling rate', '50 kS/s']], '.');
    expectWithin(rate.interval?.value, 2e-5, { rel: 1e-12 }, '1 / 50 kHz');
    const comma = readMetadata([['time per sample', '2,5E-06']], ',');
    expectWithin(comma.interval?.value, 2.5e-6, { rel: 1e-12 }, 'as written, decimal comma');
  });

  it('ignores a trigger time without a time unit and keys it does not know', () => {
    const m = readMetadata([['Trigger time', '2026-12-01 10:12'], ['Probe serial', 'x10'], ['Trigger delay', '12']], '.');
    expect(m).toEqual({ recognised: [] });
  });
});

describe('readCapture blank lines and comments', () => {
  it('skips blank lines and # comments between and inside the data, keeping line numbers true to the file', async () => {
    const text = 'sample rate,1 kHz\n\n\nCH1 (V),CH2 (V)\n1,2\n\n3,4\n# paused\n5,6\n7,8\n';
    const c = await readCapture(write('blank.csv', text));
    expect(Array.from(c.channels[0].samples)).toEqual([1, 3, 5, 7]);
    expect([c.layout.headerLine, c.layout.firstDataLine, c.layout.lastDataLine]).toEqual([4, 5, 10]);
    expectWithin(c.sampleInterval, 1e-3, { rel: 1e-12 }, 'line 1: 1 kHz');
  });
});
