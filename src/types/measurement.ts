/** Measurement results: the `measure --json` contract (schemaVersion 1). Fields may be added, never renamed. */
import type { CaptureWarning } from './capture.js';

export const MEASUREMENT_IDS = [
  'frequency',
  'period',
  'peakToPeak',
  'maximum',
  'minimum',
  'highLevel',
  'lowLevel',
  'amplitude',
  'dcOffset',
  'rms',
  'acRms',
  'riseSlope',
  'fallSlope',
  'slopeRatio',
  'symmetry',
  'linearity',
  'dutyCycle',
  'riseTime',
  'fallTime',
  'jitter',
  'overshoot',
  'undershoot',
  'thd',
  'snr',
  'sinad',
  'sfdr',
  'enob',
  'humFrequency',
  'humLevel',
  'shapeError',
  'evenOddRatio',
  'cycleToCycleJitter',
] as const;

export type MeasurementId = (typeof MEASUREMENT_IDS)[number];

/** SI unit of each measurement id. */
export const MEASUREMENT_UNITS: Readonly<Record<MeasurementId, string>> = {
  frequency: 'Hz',
  period: 's',
  peakToPeak: 'V',
  maximum: 'V',
  minimum: 'V',
  highLevel: 'V',
  lowLevel: 'V',
  amplitude: 'V',
  dcOffset: 'V',
  rms: 'V',
  acRms: 'V',
  riseSlope: 'V/s',
  fallSlope: 'V/s',
  slopeRatio: '',
  symmetry: '%',
  linearity: '%',
  dutyCycle: '%',
  riseTime: 's',
  fallTime: 's',
  jitter: 's',
  overshoot: '%',
  undershoot: '%',
  thd: '%',
  snr: 'dB',
  sinad: 'dB',
  sfdr: 'dBc',
  enob: 'bits',
  humFrequency: 'Hz',
  humLevel: 'dBc',
  shapeError: '%',
  evenOddRatio: 'dB',
  cycleToCycleJitter: 's',
};

export function isMeasurementId(x: string): x is MeasurementId {
  return (MEASUREMENT_IDS as readonly string[]).includes(x);
}

export type Shape = 'sine' | 'triangle' | 'square' | 'pulse' | 'sawtooth' | 'unknown';
export const SHAPES: readonly Shape[] = ['sine', 'triangle', 'square', 'pulse', 'sawtooth', 'unknown'];

/** Closed list of reasons a measurement is withheld. */
export type WithheldReason =
  | 'too-few-cycles'
  | 'clipped'
  | 'below-noise'
  | 'too-few-samples'
  | 'edge-too-fast'
  | 'no-signal'
  | 'invalid-samples'
  | 'aliasing'
  | 'not-applicable'
  | 'fit-failed';

/** Result of one analysis function (src/analysis): a value with its uncertainty, or a reason. */
export type MeasureResult =
  | {
      readonly ok: true;
      readonly value: number;
      /** Standard uncertainty (k = 1) in the same unit, null when none can be estimated. */
      readonly uncertainty: number | null;
      readonly unit: string;
      readonly method: string;
    }
  | {
      readonly ok: false;
      readonly reason: WithheldReason;
      readonly detail: string;
      /** What was found instead of a value: nothing above this level (upper) or below it (lower). */
      readonly bound?: MeasurementBound;
      /** How the bound was set (only with `bound`). */
      readonly method?: string;
    };

/**
 * A one-sided bound given in place of a value that could not be measured: `upper` means the
 * quantity is below `value` (nothing was detected above it), `lower` that it is above `value`.
 * The bound is already on the safe side of the measurement's uncertainty, so a decision reads it as
 * a value with no further guard band.
 */
export interface MeasurementBound {
  readonly kind: 'upper' | 'lower';
  readonly value: number;
}

/** One measurement in the JSON contract. */
export interface Measurement {
  readonly value: number | null;
  readonly unit: string;
  /** Standard uncertainty (k = 1), null when none can be estimated or the value is withheld. */
  readonly uncertainty: number | null;
  /** Why the value is withheld (only when value is null). */
  readonly note?: string;
  /** Closed-list reason (only when value is null). */
  readonly reason?: WithheldReason;
  /** How it was measured, e.g. 'least-squares fit of 41 rising mid-reference crossings'. */
  readonly method?: string;
  /** Only when value is null: the one-sided bound found instead (e.g. hum below −72 dBc), in `unit`. */
  readonly bound?: MeasurementBound;
}

export interface Harmonic {
  readonly n: number;
  readonly frequency: number;
  /** Peak amplitude in the channel's unit. */
  readonly amplitude: number;
  /** Level relative to the fundamental in dB. */
  readonly dbc: number;
  /** Ideal level of the recognised shape's series in dBc (absent for sine/unknown or zero terms). */
  readonly idealDbc?: number;
}

/** Decimated spectrum for plotting: bins evenly spaced from 0 by `binWidth`. */
export interface SpectrumPlot {
  readonly binWidth: number;
  /** Level in dB relative to the fundamental (dBc), one per plotted bin. */
  readonly dbc: readonly number[];
  readonly window: string;
  /** What 0 dB stands for: 'fundamental' (dBc), or 'largest component' when no fundamental was measured. */
  readonly reference?: string;
}

/** A short excerpt of the waveform with the analysis marks, for plots in reports. */
export interface WaveformPlot {
  /** Time of the first plotted point, seconds. */
  readonly t0: number;
  /** Interval between plotted points, seconds. */
  readonly dt: number;
  readonly values: readonly number[];
  readonly highLevel?: number;
  readonly lowLevel?: number;
  readonly midReference?: number;
  /** Mid-reference crossing times inside the excerpt. */
  readonly crossings: readonly number[];
  /** Fitted ramp segments inside the excerpt: line from (t1, v1) to (t2, v2). */
  readonly slopeFits: readonly { t1: number; v1: number; t2: number; v2: number }[];
}

/**
 * A stretch where the waveform sits flat at its extreme instead of passing through it: at the
 * capture's full scale it is the scope's clipping (values there withheld); inside it, the circuit
 * saturating (a finding: values kept, the checks they feed fail).
 */
export interface FlatTop {
  readonly side: 'high' | 'low';
  /** Mean level of the flat samples, in the channel's unit. */
  readonly level: number;
  /** Share of the record spent flat on this side, 0…1 (so of each cycle, on average). */
  readonly share: number;
  readonly samples: number;
  readonly cause: 'scope-range' | 'circuit';
  /** How the full scale was known (scope-range only): stated by the capture, or from converter end codes. */
  readonly fullScaleFrom?: 'preamble' | 'converter-codes';
}

export interface ChannelReport {
  readonly name: string;
  readonly unit: string;
  readonly shape: Shape;
  readonly measurements: Partial<Record<MeasurementId, Measurement>>;
  /** Flat tops found (absent when none). */
  readonly flatTops?: readonly FlatTop[];
  readonly harmonics: readonly Harmonic[];
  /** How harmonic amplitudes were obtained and how many (e.g. 'least-squares multi-harmonic fit, N = 50'). */
  readonly harmonicsMethod?: string;
  readonly warnings: readonly CaptureWarning[];
  /** Plot data; present in stored records, in --json only with --plot-data. */
  readonly plot?: { readonly waveform?: WaveformPlot; readonly spectrum?: SpectrumPlot };
}

export interface MeasureReport {
  readonly schemaVersion: 1;
  readonly file: string;
  readonly sha256: string;
  readonly sampleInterval: number;
  readonly samples: number;
  readonly duration: number;
  readonly warnings: readonly CaptureWarning[];
  readonly channels: readonly ChannelReport[];
}
