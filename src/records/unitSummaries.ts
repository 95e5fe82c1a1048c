/** The unit listing and the per-unit record, built from stored runs. The latest run decides the status. */
import type { RunSpec, StoredRun, UnitRecord, UnitSummary } from '../types/index.js';
import { attemptFacts, numberRuns, summarizeAttempts } from './attempts.js';

/** Serials in natural order (FK-0099 before FK-0100). */
export function compareSerials(a: string, b: string): number {
  return SERIAL_ORDER.compare(a, b) || (a < b ? -1 : a > b ? 1 : 0);
}

// One collator for every comparison: localeCompare with options builds one per call (ECMA-402 §19.1.1),
// which made sorting 10 000 units' values take seconds.
const SERIAL_ORDER = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });

/**
 * Every unit (of one spec name, or all) with the state of its attempts, from its runs' light heads
 * (oldest first): the first and latest run among that spec's runs, attempts over all of the unit's
 * runs. Runs whose summary cannot be read are left out (the audit names them).
 */
export function listUnitsFrom(heads: readonly StoredRun[], spec?: string): UnitSummary[] {
  const byUnit = new Map<string, StoredRun[]>();
  for (const r of heads) {
    const list = byUnit.get(r.unit);
    if (list) list.push(r);
    else byUnit.set(r.unit, [r]);
  }
  const out: UnitSummary[] = [];
  for (const [unit, runs] of byUnit) {
    const scoped = spec === undefined ? runs : runs.filter((h) => h.spec.name === spec);
    if (scoped.length === 0) continue;
    const first = scoped[0];
    const last = scoped[scoped.length - 1];
    out.push({
      unit,
      spec: last.spec,
      status: last.statement,
      firstStatement: first.statement,
      firstTestedAt: first.startedAt,
      lastTestedAt: last.startedAt,
      runs: scoped.length,
      ...attemptFacts(summarizeAttempts(numberRuns(runs))),
    });
  }
  return out.sort((a, b) => compareSerials(a.unit, b.unit));
}

/** The record of one unit from its runs (oldest first), or undefined when it has none. */
export function buildUnitRecord(unit: string, runs: readonly StoredRun[]): UnitRecord | undefined {
  if (runs.length === 0) return undefined;
  const latest = runs[runs.length - 1];
  const spec: RunSpec = latest.spec;
  const numbered = numberRuns(runs);
  const attempts = summarizeAttempts(numbered);
  const { state, waitingFor } = attemptFacts(attempts);
  return {
    schemaVersion: 1,
    unit,
    status: latest.statement,
    spec,
    firstTestedAt: runs[0].startedAt,
    lastTestedAt: latest.startedAt,
    runs: numbered,
    attempts,
    state,
    waitingFor,
  };
}
