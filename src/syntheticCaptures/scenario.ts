/**
 * The demo scenario (invented, for the demo only): Fernhollow Audio Lab's FH-210 "Kestrel" VCO, a
 * triangle-core oscillator on ±12 V rails. Timing capacitor 4.7 nF, comparator thresholds ±3.0 V
 * (6.0 Vpp triangle), pulse output 0…10 V high while the triangle rises. Six units, three control
 * settings each; four carry a planted fault so the demo shows what a failing unit looks like.
 */
import { synthesize } from './waveform.js';
import type { SynthSignal } from './waveform.js';
import { writeCsv } from './writeCsv.js';
import type { CsvLayoutOptions } from './writeCsv.js';

export interface ScenarioCondition {
  readonly name: string;
  /** Control voltage in volts (1 V/octave, common practice). */
  readonly control: number;
  /** Frequency of a perfect unit, Hz. */
  readonly nominal: number;
}

export const KESTREL_CONDITIONS: readonly ScenarioCondition[] = [
  { name: 'low', control: 0, nominal: 65.41 },
  { name: 'mid', control: 2, nominal: 261.63 },
  { name: 'high', control: 5, nominal: 2093.0 },
];

/** How a unit departs from the design; 0 / 1 everywhere is a perfect unit. */
export interface UnitTraits {
  readonly serial: string;
  readonly story: string;
  /** Frequency scale from the timing capacitor or reference current (1/1.06 for +6 % C). */
  readonly frequencyScale: number;
  /** Rising share of the period (0.5 when charge and discharge currents match). */
  readonly riseFraction: number;
  /** Comparator and switching delay in seconds: the ramps run past the thresholds for this long. */
  readonly comparatorDelay: number;
  /** Triangle swing peak (half of Vpp) at low frequency. */
  readonly swing: number;
  readonly triangleOffset: number;
  readonly pulseHigh: number;
  /** Clip the triangle at this level (an output stage saturating on a low rail). */
  readonly triangleClip?: number;
  readonly hum?: number;
  readonly noise: number;
  readonly seed: number;
}

const good = { frequencyScale: 1, riseFraction: 0.5, comparatorDelay: 0.4e-6, swing: 3.0, triangleOffset: 0.01, pulseHigh: 10.0, noise: 0.006 };

export const KESTREL_UNITS: readonly UnitTraits[] = [
  { ...good, serial: 'FK-0101', story: 'good unit', frequencyScale: 1.0012, seed: 101 },
  { ...good, serial: 'FK-0102', story: 'good unit', frequencyScale: 0.9985, riseFraction: 0.499, triangleOffset: -0.02, seed: 102 },
  { ...good, serial: 'FK-0103', story: 'charge current 4 % high, discharge 4 % low (mismatched current mirror)', riseFraction: 1 / (1 + 1.0833), seed: 103 },
  { ...good, serial: 'FK-0104', story: 'timing capacitor 6 % above nominal', frequencyScale: 1 / 1.06, seed: 104 },
  { ...good, serial: 'FK-0105', story: 'triangle buffer saturating on a sagging rail, 50 Hz hum on the ground lead', triangleClip: 2.55, hum: 0.05, seed: 105 },
  { ...good, serial: 'FK-0106', story: '7.6 µs comparator delay (slow comparator fitted)', comparatorDelay: 7.6e-6, seed: 106 },
];

export interface ScenarioCapture {
  readonly serial: string;
  readonly condition: string;
  readonly triangle: SynthSignal;
  readonly pulse: SynthSignal;
}

/** Samples per period and cycles per capture: enough cycles for frequency, modest size for the repo. */
const SAMPLES_PER_PERIOD = 200;
const CYCLES = 30;

export function kestrelCapture(unit: UnitTraits, condition: ScenarioCondition): ScenarioCapture {
  // A delay t_d lets each ramp run on past its threshold by slope·t_d and come back: each of the two
  // ramps lasts 2·t_d longer, so the period grows by 4·t_d while the slopes stay I/C. That holds for
  // matched ramps (the delayed unit FK-0106); with unequal slopes the period grows by t_d·(2 + r + 1/r)
  // (checked in ngspice, test/ngspice/delayedComparator.test.ts), which for FK-0103's r = 1.083 and the
  // good units' 0.4 µs differs from 4·t_d by 2.6 ns a period, a few ppm: the scenario keeps 4·t_d.
  const ideal = condition.nominal * unit.frequencyScale;
  const frequency = 1 / (1 / ideal + 4 * unit.comparatorDelay);
  const slope = 2 * unit.swing * 2 * ideal; // V/s on a symmetric ramp at the ideal frequency
  const amplitude = unit.swing + slope * unit.comparatorDelay;
  const sampleRate = frequency * SAMPLES_PER_PERIOD * 1.0137; // not an integer number of samples per period
  const samples = SAMPLES_PER_PERIOD * CYCLES;
  const seed = unit.seed * 10 + KESTREL_CONDITIONS.indexOf(condition);
  // Ground-loop pickup: the mains frequency and the rectifier ripple at twice it.
  const hum = unit.hum ? [{ frequency: 50, amplitude: unit.hum, phase: 0.3 }, { frequency: 100, amplitude: 0.6 * unit.hum, phase: 1.1 }] : [];
  const triangle = synthesize({
    shape: 'triangle',
    frequency,
    amplitude,
    offset: unit.triangleOffset,
    riseFraction: unit.riseFraction,
    phase: 0.137,
    sampleRate,
    samples,
    noise: unit.noise,
    hum,
    bits: 8,
    fullScale: 8 * 2.5,
    clip: unit.triangleClip ? { low: -99, high: unit.triangleClip } : undefined,
    seed,
  });
  const pulse = synthesize({
    shape: 'pulse',
    frequency,
    amplitude: unit.pulseHigh / 2,
    duty: unit.riseFraction,
    phase: 0.137,
    sampleRate,
    samples,
    edge: { tau: 1.5e-6 }, // a comparator edge: far faster than these timebases resolve
    noise: unit.noise * 2,
    hum,
    bits: 8,
    fullScale: 8 * 5,
    seed: seed + 5000,
  });
  return { serial: unit.serial, condition: condition.name, triangle, pulse };
}

/** Each unit's captures come from a different kind of instrument, so the demo shows every layout. */
const LAYOUTS: Readonly<Record<string, CsvLayoutOptions>> = {
  // A bench scope's plain export.
  'FK-0101': { delimiter: ',', unitStyle: 'parens', format: 'exponential', precision: 7 },
  // A European scope: semicolons, decimal comma, a preamble, CRLF, time in ms.
  'FK-0102': { delimiter: ';', decimalMark: ',', preamble: 'auto', lineEnding: 'crlf', timeUnit: 'ms', format: 'shortest' },
  // A logger writing tab-separated millivolts and milliseconds with bracketed units.
  'FK-0103': { delimiter: '\t', unitStyle: 'brackets', timeUnit: 'ms', format: 'fixed', precision: 4 },
  // A sample-index column; the interval comes from the preamble.
  'FK-0104': { delimiter: ',', xColumn: 'index', preamble: 'auto', format: 'exponential', precision: 6 },
  // A simulator-style text dump: runs of spaces, no header.
  'FK-0105': { delimiter: ' ', header: false, format: 'exponential', precision: 7 },
  // No x column, a BOM, CRLF and a footer line.
  'FK-0106': { delimiter: ',', xColumn: 'none', preamble: 'auto', bom: true, lineEnding: 'crlf', footer: 'end of record', format: 'shortest' },
};

const CHANNEL_UNITS: Readonly<Record<string, string>> = { 'FK-0103': 'mV' };

export interface ScenarioFile {
  readonly name: string;
  readonly content: string;
}

/** Every demo capture as CSV text, named `{unit}_{condition}.csv`. */
export function kestrelSampleFiles(): ScenarioFile[] {
  const files: ScenarioFile[] = [];
  for (const unit of KESTREL_UNITS) {
    for (const condition of KESTREL_CONDITIONS) {
      const cap = kestrelCapture(unit, condition);
      const unitName = CHANNEL_UNITS[unit.serial] ?? 'V';
      const content = writeCsv(
        [
          { name: 'CH1', unit: unitName, signal: cap.triangle },
          { name: 'CH2', unit: unitName, signal: cap.pulse },
        ],
        LAYOUTS[unit.serial],
      );
      files.push({ name: `${unit.serial}_${condition.name}.csv`, content });
    }
  }
  return files;
}
