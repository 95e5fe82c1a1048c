/**
 * One display name per measurement id, used by every output that names a measurement: terminal text,
 * Markdown, HTML, CSV, JSON (where it carries labels) and the bench page. Names follow the trade's
 * terms: "state level" after IEEE 181-2011 §3.1, "rise time" and "fall time" measured 10 %–90 % (IEEE
 * 181-2011 §5.3.3), THD/SNR/SINAD/SFDR/ENOB after IEEE 1057-2017; the rest are common practice (no
 * source). Ids are never renamed; a name may be improved, so compare ids, not names.
 */
import type { MeasurementId } from './measurement.js';

export const MEASUREMENT_LABELS: Readonly<Record<MeasurementId, string>> = {
  frequency: 'frequency',
  period: 'period',
  jitter: 'period jitter',
  cycleToCycleJitter: 'cycle-to-cycle jitter',
  highLevel: 'high state level',
  lowLevel: 'low state level',
  amplitude: 'amplitude',
  maximum: 'maximum',
  minimum: 'minimum',
  peakToPeak: 'peak-to-peak',
  dcOffset: 'DC offset',
  rms: 'RMS',
  acRms: 'AC RMS',
  riseSlope: 'rising slope',
  fallSlope: 'falling slope',
  slopeRatio: 'slope ratio',
  symmetry: 'symmetry (rising share)',
  linearity: 'ramp non-linearity',
  dutyCycle: 'duty cycle',
  riseTime: 'rise time',
  fallTime: 'fall time',
  overshoot: 'overshoot',
  undershoot: 'undershoot',
  thd: 'THD',
  snr: 'SNR',
  sinad: 'SINAD',
  sfdr: 'SFDR',
  enob: 'ENOB',
  shapeError: 'shape error',
  evenOddRatio: 'even/odd ratio',
  humFrequency: 'hum frequency',
  humLevel: 'hum level',
};

/** The display name of a measurement id; an unknown id (from a newer record) as it is. */
export function measurementLabel(id: string): string {
  return (MEASUREMENT_LABELS as Readonly<Record<string, string>>)[id] ?? id;
}

/** The display names of the ids given, as one object for a JSON document's `labels` (ids in first-seen order). */
export function measurementLabelsOf(ids: Iterable<string>): Readonly<Record<string, string>> {
  const out: Record<string, string> = {};
  for (const id of ids) if (!(id in out)) out[id] = measurementLabel(id);
  return out;
}
