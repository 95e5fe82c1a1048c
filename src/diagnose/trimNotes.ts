/**
 * Remarks (as data) on how the triangle's symmetry and amplitude move across the range. In a triangle core both
 * drift with frequency: a fixed comparator delay lets each ramp run past its threshold by slope × delay,
 * so the swing grows with frequency, and charge/discharge currents that track the control unequally
 * move the symmetry (elementary; see the scenario's delay model). Thresholds are our choice: 5 % of
 * amplitude and 2 percentage points of symmetry, about what shows on a scope at a glance.
 */
import type { TrackingFigures, TrimRemark } from '../types/index.js';

const AMPLITUDE_NOTE = 0.05;
const SYMMETRY_NOTE = 2;

export function driftRemarks(t: TrackingFigures): TrimRemark[] {
  const out: TrimRemark[] = [];
  const a = t.amplitude;
  if (a && a.first > 0 && Math.abs(a.last / a.first - 1) > AMPLITUDE_NOTE) out.push({ code: 'amplitude-drift', first: a.first, last: a.last, unit: 'V' });
  const s = t.symmetry;
  if (s && s.max - s.min > SYMMETRY_NOTE) out.push({ code: 'symmetry-drift', first: s.first, last: s.last, spread: s.max - s.min });
  return out;
}
