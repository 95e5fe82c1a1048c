/** The batch statistics' remarks (records/summarizeBatch.ts gives them as data) in words, numbers by the one formatter. */
import type { BatchRemark, MeasurementStats } from '../types/index.js';
import { formatStat, scaleOf } from './reportNumbers.js';

/** One remark in words; `m` gives the unit and prefix of the quantity a remark's figures are in. */
export function batchRemarkWords(r: BatchRemark, m?: MeasurementStats): string {
  switch (r.kind) {
    case 'withheld':
      return `${r.units} ${r.units === 1 ? 'unit' : 'units'} not measured, left out`;
    case 'too-few-units':
      return 'needs at least two measured units for a spread; no Cp/Cpk';
    case 'no-spread':
      return 'all values equal: no spread, so Cp/Cpk are not defined';
    case 'no-limits':
      return 'no tolerance limits in the spec; no Cp/Cpk';
    case 'one-sided':
      return 'one-sided tolerance: Cpk from that side only, no Cp';
    case 'few-units':
      return `only ${r.units} units: Cp/Cpk are rough estimates`;
    case 'limits-differ':
      return 'limits differ between spec revisions; the newest are used';
    case 'spread-below-u': {
      const q = (x: number): string => formatStat(x, m?.unit ?? '', m ? scaleOf(m) : null, 2);
      return `spread between units (s = ${q(r.sd)}) below the measurement's standard uncertainty (u = ${q(r.u)}): no Cp/Cpk, they would describe the measurement, not the units`;
    }
    case 'several-revisions':
      return `runs were checked under ${r.revisions.length} spec revisions (${r.revisions.join(', ')})`;
  }
}

/** A quantity's remarks in words, in order. */
export function measurementNotes(m: MeasurementStats): string[] {
  return m.remarks.map((r) => batchRemarkWords(r, m));
}
