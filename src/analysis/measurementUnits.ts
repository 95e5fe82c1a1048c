/**
 * The unit of each measurement for a channel. MEASUREMENT_UNITS lists SI units for a voltage channel;
 * a current channel (unit 'A') reports its levels in A and its slopes in A/s. A channel without a
 * unit is taken as volts (scope exports), and measureCapture warns that it assumed so.
 */
import type { MeasurementId } from '../types/index.js';
import { MEASUREMENT_UNITS } from '../types/index.js';

export function unitFor(id: MeasurementId, channelUnit: string): string {
  const si = MEASUREMENT_UNITS[id];
  if (channelUnit === '' || channelUnit === 'V') return si;
  if (si === 'V') return channelUnit;
  if (si === 'V/s') return `${channelUnit}/s`;
  return si;
}
