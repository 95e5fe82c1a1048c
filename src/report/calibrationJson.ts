/** `calibrate --json`: one document (schemaVersion 1) with the iteration and, when stored, where it went. */
import type { CalibrationIteration } from '../types/index.js';
import type { IterationPlace } from './calibrationText.js';

export interface CalibrationDocument {
  readonly schemaVersion: 1;
  readonly iteration: CalibrationIteration;
  /** The calibration run and iteration number in the records; absent with --no-store. */
  readonly stored?: IterationPlace;
}

export function calibrationDocument(iteration: CalibrationIteration, place?: IterationPlace): CalibrationDocument {
  return { schemaVersion: 1, iteration, ...(place ? { stored: place } : {}) };
}
