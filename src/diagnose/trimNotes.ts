/**
 * Remarks on how the triangle's symmetry and amplitude move across the range. In a triangle core both
 * drift with frequency: a fixed comparator delay lets each ramp run past its threshold by slope × delay,
 * so the swing grows with frequency, and charge/discharge currents that track the control unequally
 * move the symmetry (elementary; see the scenario's delay model). Thresholds are our choice: 5 % of
 * amplitude and 2 percentage points of symmetry, about what shows on a scope at a glance.
 */
import type { TrackingFigures } from '../types/index.js';
import { signed } from './trimWords.js';

const AMPLITUDE_NOTE = 0.05;
const SYMMETRY_NOTE = 2;

export function driftNotes(t: TrackingFigures): string[] {
  const notes: string[] = [];
  const a = t.amplitude;
  if (a && a.first > 0 && Math.abs(a.last / a.first - 1) > AMPLITUDE_NOTE) {
    notes.push(`amplitude changes ${signed(100 * (a.last / a.first - 1), 1)} % from the first to the last step (${a.first.toFixed(2)} → ${a.last.toFixed(2)} Vpp): a switching delay lets the ramps overshoot the thresholds at high frequency`);
  }
  const s = t.symmetry;
  if (s && s.max - s.min > SYMMETRY_NOTE) {
    notes.push(`symmetry moves across the range (${s.first.toFixed(1)} % → ${s.last.toFixed(1)} %, spread ${(s.max - s.min).toFixed(1)} points): charge and discharge currents do not track the control equally`);
  }
  return notes;
}
