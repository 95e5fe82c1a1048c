// Placeholder until the analysis lands (being written now); replaced, not kept.
import type { Capture, MeasureReport } from '../types/index.js';
export interface MeasureCaptureOptions { readonly plotData?: boolean }
export function measureCapture(_capture: Capture, _options: MeasureCaptureOptions = {}): MeasureReport {
  throw new Error('analysis not written yet');
}
