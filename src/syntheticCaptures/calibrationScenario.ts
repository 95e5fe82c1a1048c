/**
 * The demo calibration (invented, for the demo only): unit FK-0104 of the FH-210 "Kestrel" VCO, whose
 * timing capacitor sits 6 % high, tracked at 0 … 5 V control (1 V/octave, 65.41 Hz at 0 V). The first
 * capture set ("before") shows a scale error (0.987 octave/V), the capacitor's offset (−100.9 cents)
 * and a 1 µs switching delay, not yet compensated, flattening the top; the second ("after") is taken after the
 * scale, offset and high-frequency trims. Triangle channel only, 20 cycles per capture, to stay small.
 */
import { synthesize } from './waveform.js';
import { writeCsv } from './writeCsv.js';
import type { ScenarioFile } from './scenario.js';

export interface CalibrationState {
  /** Folder of the capture set under samples/calibration/. */
  readonly folder: string;
  /** Octaves per volt the unit actually produces (1 when the scale trim is right). */
  readonly scale: number;
  /** Frequency error at 0 V, cents (timing capacitor and offset trim together). */
  readonly offsetCents: number;
  /** Comparator delay left uncompensated, seconds: the period grows by 4·t_d. */
  readonly comparatorDelay: number;
}

export const CALIBRATION_UNIT = 'FK-0104';
export const CALIBRATION_REFERENCE = 65.41;
export const CALIBRATION_CONTROLS: readonly number[] = [0, 1, 2, 3, 4, 5];

export const CALIBRATION_STATES: readonly CalibrationState[] = [
  { folder: 'before', scale: 0.987, offsetCents: 1200 * Math.log2(1 / 1.06), comparatorDelay: 1.0e-6 },
  { folder: 'after', scale: 0.9998, offsetCents: 0.8, comparatorDelay: 0.05e-6 },
];

/** The frequency the unit runs at for a control voltage in a given state. */
export function calibrationFrequency(state: CalibrationState, control: number): number {
  const ideal = CALIBRATION_REFERENCE * 2 ** (state.scale * control + state.offsetCents / 1200);
  return 1 / (1 / ideal + 4 * state.comparatorDelay);
}

const SAMPLES_PER_PERIOD = 40;
const CYCLES = 20;

/** Every demo calibration capture as CSV text, named `{folder}/{unit}_cv{control}.csv`. */
export function kestrelCalibrationFiles(): ScenarioFile[] {
  return CALIBRATION_STATES.flatMap((state, k) =>
    CALIBRATION_CONTROLS.map((control, i) => {
      const frequency = calibrationFrequency(state, control);
      // A delay lets each ramp run past its threshold by slope·t_d: the swing grows with frequency.
      const amplitude = 3.0 + 12 * frequency * state.comparatorDelay;
      const triangle = synthesize({
        shape: 'triangle',
        frequency,
        amplitude,
        offset: 0.01,
        riseFraction: 0.5 - 0.0004 * control,
        phase: 0.21,
        sampleRate: frequency * SAMPLES_PER_PERIOD * 1.0113,
        samples: SAMPLES_PER_PERIOD * CYCLES,
        noise: 0.006,
        bits: 8,
        fullScale: 8 * 2.5,
        seed: 4100 + 10 * k + i,
      });
      const content = writeCsv([{ name: 'CH1', unit: 'V', signal: triangle }], { delimiter: ',', format: 'exponential', precision: 7 });
      return { name: `${state.folder}/${CALIBRATION_UNIT}_cv${control}.csv`, content };
    }),
  );
}
