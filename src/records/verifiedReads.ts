/**
 * The rule every read of a store follows, whatever its engine: nothing is read from a store that
 * failed verification unless asked ('mark'), and then every run or iteration the audit names is
 * marked not intact. The row audit (fingerprints and chain) is computed once per open store, a
 * unit's captures once per unit, the full audit (every capture) once when asked for.
 */
import type { StoredCalibrationRun, StoredRun, UnitSummary } from '../types/index.js';
import type { AuditProblem, StoreAudit } from './auditStore.js';
import { storeError, unverifiedError } from './storeErrors.js';

export interface AuditSources {
  readonly rows: () => StoreAudit;
  readonly full: () => StoreAudit;
  readonly unitCaptures: (unit: string) => readonly AuditProblem[];
  /** Turns an engine's low-level error into a BenchError (storeError for the embedded store). */
  readonly wrapError?: (err: unknown) => unknown;
}

export interface VerifiedReads {
  verified<T>(read: () => T, unit?: string): T;
  guarded<T>(fn: () => T): T;
  audit(): StoreAudit;
  rowAudit(): StoreAudit;
  mark(runs: StoredRun[]): StoredRun[];
  markCalibrations(list: StoredCalibrationRun[]): StoredCalibrationRun[];
}

export function verifiedReads(label: string, unverified: 'refuse' | 'mark', sources: AuditSources): VerifiedReads {
  const wrapError = sources.wrapError ?? ((err: unknown) => storeError(err, label));
  const guarded = <T>(fn: () => T): T => {
    try {
      return fn();
    } catch (err) {
      throw wrapError(err);
    }
  };
  let rows: StoreAudit | undefined;
  let full: StoreAudit | undefined;
  const unitCaptures = new Map<string, readonly AuditProblem[]>();
  const rowAudit = (): StoreAudit => full ?? (rows ??= guarded(sources.rows));
  const audit = (): StoreAudit => (full ??= guarded(sources.full));
  const scoped = (unit?: string): StoreAudit => {
    const base = rowAudit();
    if (unit === undefined || full !== undefined) return base;
    let captures = unitCaptures.get(unit);
    if (captures === undefined) {
      captures = guarded(() => sources.unitCaptures(unit));
      unitCaptures.set(unit, captures);
    }
    return captures.length === 0 ? base : { ...base, problems: [...base.problems, ...captures] };
  };
  let lastScope: StoreAudit | undefined;
  const flagged = (kind: 'run' | 'calibration'): Set<number> => new Set((lastScope ?? rowAudit()).problems.filter((p) => p.kind === kind && p.id !== null).map((p) => p.id as number));
  return {
    verified: (read, unit) => {
      const found = (lastScope = scoped(unit));
      if (found.problems.length > 0 && unverified === 'refuse') throw unverifiedError(label, found);
      return guarded(read);
    },
    guarded,
    audit,
    rowAudit,
    mark: (runs) => {
      const bad = flagged('run');
      return runs.map((r) => (r.intact && bad.has(r.id) ? { ...r, intact: false } : r));
    },
    markCalibrations: (list) => {
      const bad = flagged('calibration');
      return list.map((c) => ({ ...c, iterations: c.iterations.map((i) => (i.intact && bad.has(i.id) ? { ...i, intact: false } : i)) }));
    },
  };
}

/** Each unit's runs that failed verification, by number, so a listing can mark the unit. */
export function withUnverified(units: UnitSummary[], audit: StoreAudit): UnitSummary[] {
  const byUnit = new Map<string, number[]>();
  for (const p of audit.problems) {
    if (p.kind !== 'run' || p.id === null || p.unit === null) continue;
    byUnit.set(p.unit, [...new Set([...(byUnit.get(p.unit) ?? []), p.id])]);
  }
  return units.map((u) => (byUnit.has(u.unit) ? { ...u, unverifiedRuns: byUnit.get(u.unit) } : u));
}
