/**
 * The rule every read of a store follows, whatever its engine: nothing is read from a store that
 * failed verification unless asked ('mark'), and then every run or iteration the audit names is
 * marked not intact. Verification comes in scopes, each computed once per open store:
 *
 * - the listing (units, batch, spec names): the hash chain, every run row against the chain, every
 *   run summary against its fingerprint, the calibration iterations; no full verdict is read;
 * - a unit (its record, its runs, its calibrations): the listing, plus each of the unit's runs
 *   re-hashed in full, its verdict against its summary, and its archived captures;
 * - every run (runs() without a unit): the listing, plus every run re-hashed in full;
 * - the full audit (audit()): all of that and every archived capture.
 */
import type { StoredCalibrationRun, StoredRun, UnitSummary } from '../types/index.js';
import type { AuditProblem, StoreAudit } from './auditStore.js';
import type { SummaryArray } from './runSummary.js';
import { storeError, unverifiedError } from './storeErrors.js';

export interface AuditSources {
  /** The listing's verification, with the summary rows it read (the listing is built from them). */
  readonly listing: () => { readonly audit: StoreAudit; readonly summaries: readonly SummaryArray[] };
  /** Every run re-hashed against its fingerprint (no archive). */
  readonly rows: () => StoreAudit;
  readonly full: () => StoreAudit;
  /** The problems of one unit's full read: its runs re-hashed, its captures. */
  readonly unit: (unit: string) => readonly AuditProblem[];
  /** Turns an engine's low-level error into a BenchError (storeError for the embedded store). */
  readonly wrapError?: (err: unknown) => unknown;
}

/** Which verification a read needs: the listing's, one unit's, or every run's. */
export type ReadScope = { readonly unit: string } | 'listing' | 'all-runs';

export interface VerifiedReads {
  verified<T>(read: () => T, scope?: ReadScope | string): T;
  guarded<T>(fn: () => T): T;
  audit(): StoreAudit;
  /** The listing's verification (computed once per open store). */
  listingAudit(): StoreAudit;
  /** The summary rows the listing verified, as read (read once per open store). */
  summaryRows(): readonly SummaryArray[];
  /** The problems of the scope last verified, to refuse or mark with besides. */
  refuse(problems: readonly AuditProblem[]): void;
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
  let listing: { readonly audit: StoreAudit; readonly summaries: readonly SummaryArray[] } | undefined;
  let rows: StoreAudit | undefined;
  let full: StoreAudit | undefined;
  const units = new Map<string, readonly AuditProblem[]>();
  const listingRead = () => (listing ??= guarded(sources.listing));
  const listingAudit = (): StoreAudit => full ?? listingRead().audit;
  const audit = (): StoreAudit => (full ??= merged(listingRead().audit, guarded(sources.full).problems));
  const allRuns = (): StoreAudit => full ?? (rows ??= merged(listingRead().audit, guarded(sources.rows).problems));
  const scoped = (scope: ReadScope): StoreAudit => {
    if (scope === 'listing') return listingAudit();
    if (scope === 'all-runs') return allRuns();
    const base = listingAudit();
    if (full !== undefined) return base;
    let found = units.get(scope.unit);
    if (found === undefined) {
      found = guarded(() => sources.unit(scope.unit));
      units.set(scope.unit, found);
    }
    return found.length === 0 ? base : merged(base, found);
  };
  let lastScope: StoreAudit | undefined;
  const flagged = (kind: 'run' | 'calibration'): Set<number> => new Set((lastScope ?? listingAudit()).problems.filter((p) => p.kind === kind && p.id !== null).map((p) => p.id as number));
  return {
    verified: (read, scope = 'listing') => {
      const found = (lastScope = scoped(typeof scope === 'string' && scope !== 'listing' && scope !== 'all-runs' ? { unit: scope } : scope));
      if (found.problems.length > 0 && unverified === 'refuse') throw unverifiedError(label, found);
      return guarded(read);
    },
    guarded,
    audit,
    listingAudit,
    summaryRows: () => listingRead().summaries,
    refuse: (problems) => {
      if (problems.length === 0) return;
      lastScope = merged(lastScope ?? listingAudit(), problems);
      if (unverified === 'refuse') throw unverifiedError(label, lastScope);
    },
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

/** An audit with more problems, each (row, problem, detail) named once. */
function merged(base: StoreAudit, more: readonly AuditProblem[]): StoreAudit {
  if (more.length === 0) return base;
  const seen = new Set(base.problems.map(keyOf));
  const added = more.filter((p) => !seen.has(keyOf(p)) && (seen.add(keyOf(p)), true));
  return added.length === 0 ? base : { ...base, problems: [...base.problems, ...added] };
}

const keyOf = (p: AuditProblem): string => `${p.kind}:${p.id}:${p.problem}:${p.detail}`;

/** Each unit's runs that failed verification, by number, so a listing can mark the unit. */
export function withUnverified(units: UnitSummary[], audit: StoreAudit): UnitSummary[] {
  const byUnit = new Map<string, number[]>();
  for (const p of audit.problems) {
    if (p.kind !== 'run' || p.id === null || p.unit === null) continue;
    byUnit.set(p.unit, [...new Set([...(byUnit.get(p.unit) ?? []), p.id])]);
  }
  return units.map((u) => (byUnit.has(u.unit) ? { ...u, unverifiedRuns: byUnit.get(u.unit) } : u));
}
