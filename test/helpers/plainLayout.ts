/** The layout of a plain comma-separated capture with a header, a time column and volts, for in-memory Captures in tests. */
import type { CaptureLayout } from '../../src/types/index.js';

export function plainLayout(rows: number, channelNames: readonly string[] = []): CaptureLayout {
  return {
    delimiter: ',',
    decimalMark: '.',
    headerLine: 1,
    firstDataLine: 2,
    lastDataLine: rows + 1,
    columns: channelNames.length === 0 ? [] : [{ name: 'Time', unit: 's', scale: 1, siUnit: 's' }, ...channelNames.map((n) => ({ name: n, unit: 'V', scale: 1, siUnit: 'V' }))],
    timeColumn: 0,
    indexColumn: null,
    timing: 'time-column',
    resampled: false,
    compressed: false,
    bom: false,
    lineEnding: 'lf',
  };
}
