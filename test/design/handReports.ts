/**
 * Hand-built measure reports (invented numbers, for decision tests only) and the Capture stub that
 * goes with them, so decisions can be tested without the analysis stage.
 */
import type { Capture, ChannelReport, Measurement, MeasureReport, MeasurementId, Shape } from '../../src/types/index.js';
import { MEASUREMENT_UNITS } from '../../src/types/index.js';
import { plainLayout } from '../helpers/plainLayout.js';

export type Values = Partial<Record<MeasurementId, number | null | [number, number | null]>>;

export function channel(name: string, shape: Shape, values: Values, notes: Partial<Record<MeasurementId, string>> = {}): ChannelReport {
  const measurements: Partial<Record<MeasurementId, Measurement>> = {};
  for (const [id, v] of Object.entries(values) as [MeasurementId, Values[MeasurementId]][]) {
    const unit = MEASUREMENT_UNITS[id];
    if (v === null || v === undefined) measurements[id] = { value: null, unit, uncertainty: null, reason: 'too-few-cycles', note: notes[id] ?? 'only 1 whole period in the capture' };
    else if (Array.isArray(v)) measurements[id] = { value: v[0], unit, uncertainty: v[1] };
    else measurements[id] = { value: v, unit, uncertainty: 0 };
  }
  return { name, unit: 'V', shape, measurements, harmonics: [], warnings: [] };
}

export function report(file: string, channels: readonly ChannelReport[]): MeasureReport {
  return { schemaVersion: 1, file, sha256: 'a'.repeat(64), sampleInterval: 1e-5, samples: 1000, duration: 0.01, warnings: [], channels };
}

export function captureStub(path: string, names: readonly string[]): Capture {
  return {
    path,
    sha256: 'a'.repeat(64),
    size: 1234,
    layout: plainLayout(1000, names),
    metadata: {},
    startTime: 0,
    sampleInterval: 1e-5,
    length: 1000,
    channels: names.map((n) => ({ name: n, unit: 'V', displayUnit: 'V', samples: new Float64Array(0), invalidCount: 0 })),
    warnings: [],
  };
}
