/** The unit listing and the per-unit record, built from stored runs. The latest run decides the status. */
import type { Database } from 'better-sqlite3';
import type { RunSpec, Statement, StoredRun, UnitRecord, UnitSummary } from '../types/index.js';
import { attemptFacts, numberRuns, readRunHeads, summarizeAttempts } from './attempts.js';

interface SummaryRow {
  unit: string;
  spec_name: string;
  spec_revision: string;
  spec_sha256: string;
  statement: Statement;
  started_at: string;
  rn_first: number;
  rn_last: number;
  n: number;
}

const SUMMARY_SQL = `
SELECT * FROM (
  SELECT unit, spec_name, spec_revision, spec_sha256, statement, started_at,
    ROW_NUMBER() OVER (PARTITION BY unit ORDER BY started_at, id) AS rn_first,
    ROW_NUMBER() OVER (PARTITION BY unit ORDER BY started_at DESC, id DESC) AS rn_last,
    COUNT(*) OVER (PARTITION BY unit) AS n
  FROM runs WHERE (@spec IS NULL OR spec_name = @spec)
) WHERE rn_first = 1 OR rn_last = 1`;

/** Serials in natural order (FK-0099 before FK-0100). */
export function compareSerials(a: string, b: string): number {
  return a.localeCompare(b, 'en', { numeric: true, sensitivity: 'base' }) || (a < b ? -1 : a > b ? 1 : 0);
}

export function listUnits(db: Database, spec?: string): UnitSummary[] {
  const rows = db.prepare(SUMMARY_SQL).all({ spec: spec ?? null }) as SummaryRow[];
  const byUnit = new Map<string, { first?: SummaryRow; last?: SummaryRow }>();
  for (const r of rows) {
    const e = byUnit.get(r.unit) ?? {};
    if (r.rn_first === 1) e.first = r;
    if (r.rn_last === 1) e.last = r;
    byUnit.set(r.unit, e);
  }
  const out: UnitSummary[] = [];
  for (const [unit, { first, last }] of byUnit) {
    if (!first || !last) continue;
    out.push({
      unit,
      spec: { name: last.spec_name, revision: last.spec_revision, sha256: last.spec_sha256 },
      status: last.statement,
      firstStatement: first.statement,
      firstTestedAt: first.started_at,
      lastTestedAt: last.started_at,
      runs: last.n,
      // The light read: state and statements only, not the measurement reports.
      ...attemptFacts(summarizeAttempts(numberRuns(readRunHeads(db, unit)))),
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
