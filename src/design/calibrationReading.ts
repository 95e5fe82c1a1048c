/**
 * One step's reading: the tracked output's channel in a measured capture, and the three figures a
 * calibration uses from it: frequency (with its standard uncertainty), symmetry and peak-to-peak.
 */
import { BenchError } from '../types/index.js';
import type { MeasureReport, Measurement } from '../types/index.js';
import type { CalibrationSection, CalibrationStep } from './calibrationTypes.js';

export interface StepReading {
  readonly step: CalibrationStep;
  readonly capture: string;
  readonly sha256: string;
  readonly frequency: Measurement | null;
  readonly symmetry: Measurement | null;
  readonly peakToPeak: Measurement | null;
}

export function calibrationReading(section: CalibrationSection, step: CalibrationStep, report: MeasureReport): StepReading {
  const { channel } = section;
  const found =
    typeof channel === 'number' ? report.channels[channel - 1] : report.channels.find((c) => c.name.trim().toLowerCase() === channel.trim().toLowerCase());
  if (!found) {
    throw new BenchError({
      code: 'calibration.no-channel',
      file: report.file,
      problem: `no channel ${typeof channel === 'number' ? `number ${channel}` : `"${channel}"`} for the tracked output "${section.output}"`,
      expected: `a channel of this capture: ${report.channels.map((c, i) => `${i + 1} "${c.name}"`).join(', ')}`,
      fix: `set \`channel:\` of output "${section.output}", or \`calibration.output\`, to one of them`,
    });
  }
  const m = found.measurements;
  return { step, capture: report.file, sha256: report.sha256, frequency: m.frequency ?? null, symmetry: m.symmetry ?? null, peakToPeak: m.peakToPeak ?? null };
}
