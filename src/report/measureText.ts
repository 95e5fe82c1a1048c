// Placeholder until the measurement table lands (being written now); replaced, not kept.
import type { MeasureReport } from '../types/index.js';
import type { TextStyle } from './style.js';
export function renderMeasureText(reports: readonly MeasureReport[], _style: TextStyle): string {
  return `${JSON.stringify(reports)}\n`;
}
