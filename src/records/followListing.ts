/**
 * What the board's follower (followStore.ts) answers from what it has verified: the audit, with the
 * problems named in auditStore's words, and the units listing as listUnits gives it, from the kept
 * light run heads.
 */
import type { StoredRun, UnitSummary } from '../types/index.js';
import type { ChainEntry } from './chain.js';
import type { AuditProblem, StoreAudit } from './auditStore.js';
import type { DamagedRow } from './readRuns.js';
import type { attemptFacts } from './attempts.js';

export interface UnitState {
  readonly rows: readonly { kind: 'run' | 'calibration'; id: number; digest: string; intact: boolean }[];
  readonly damaged: readonly DamagedRow[];
  readonly heads: readonly StoredRun[];
  /** The attempts of all the unit's runs, as a listing shows them; worked out once per verification. */
  readonly facts: ReturnType<typeof attemptFacts> | null;
}

export interface FollowedStore {
  /** As auditStore(…, { archive: false }) would find it now. */
  readonly audit: StoreAudit;
  /** As listUnits gives them, with each unit's unverified runs. */
  /** The same array for the same snapshot and spec, so a caller may keep what it built from it. */
  units(spec?: string): readonly UnitSummary[];
  /** How many rows were verified since the follower started, and how many full passes it made (for tests and the bench). */
  readonly verifiedRows: number;
  readonly fullPasses: number;
}

/** The audit and listing as they stand: the same problems auditStore names, in the same words. */
export function snapshot(entries: readonly ChainEntry[], linkProblems: readonly AuditProblem[], units: ReadonlyMap<string, UnitState>, head: string, verifiedRows: number, fullPasses: number): FollowedStore {
  const problems: AuditProblem[] = [...linkProblems];
  const byRow = new Map(entries.map((e) => [`${e.kind}:${e.row_id}`, e]));
  const present = new Set<string>();
  for (const [unit, s] of units) {
    for (const d of s.damaged) {
      present.add(`${d.kind}:${d.id}`);
      problems.push({ kind: d.kind, id: d.id, unit: d.unit, problem: 'damaged', detail: d.problem });
    }
    for (const r of s.rows) {
      present.add(`${r.kind}:${r.id}`);
      const entry = byRow.get(`${r.kind}:${r.id}`);
      if (!r.intact) problems.push({ kind: r.kind, id: r.id, unit, problem: 'changed', detail: 'its content no longer matches the fingerprint taken when it was stored' });
      else if (!entry) problems.push({ kind: r.kind, id: r.id, unit, problem: 'unchained', detail: 'it is not in the hash chain: it was not stored by benchproof' });
      else if (entry.row_digest !== r.digest) problems.push({ kind: r.kind, id: r.id, unit, problem: 'changed', detail: 'its fingerprint differs from the one the hash chain holds (it was edited and re-fingerprinted)' });
    }
  }
  for (const e of entries) {
    if ((e.kind === 'run' || e.kind === 'calibration') && !present.has(`${e.kind}:${e.row_id}`)) {
      problems.push({ kind: e.kind, id: e.row_id, unit: null, problem: 'missing', detail: 'it is in the hash chain but no longer in the store: it was deleted' });
    }
  }
  const audit: StoreAudit = { head, chained: entries.filter((e) => e.kind !== 'gap').length, archived: 0, problems };
  const listed = new Map<string | undefined, UnitSummary[]>();
  const list = (spec?: string): UnitSummary[] => {
    let found = listed.get(spec);
    if (!found) listed.set(spec, (found = listFollowed(units, problems, spec)));
    return found;
  };
  return { audit, units: list, verifiedRows, fullPasses };
}

/** listUnits over the kept heads: first and latest run under the spec, attempts over all the unit's runs. */
function listFollowed(units: ReadonlyMap<string, UnitState>, problems: readonly AuditProblem[], spec?: string): UnitSummary[] {
  const unverified = new Map<string, Set<number>>();
  for (const p of problems) {
    if (p.kind !== 'run' || p.id === null || p.unit === null) continue;
    unverified.set(p.unit, (unverified.get(p.unit) ?? new Set()).add(p.id));
  }
  const out: UnitSummary[] = [];
  for (const [unit, s] of units) {
    const mine = spec === undefined ? s.heads : s.heads.filter((r) => r.spec.name === spec);
    if (mine.length === 0) continue;
    const first = mine[0];
    const last = mine[mine.length - 1];
    const bad = unverified.get(unit);
    out.push({
      unit,
      spec: last.spec,
      status: last.statement,
      firstStatement: first.statement,
      firstTestedAt: first.startedAt,
      lastTestedAt: last.startedAt,
      runs: mine.length,
      ...s.facts,
      ...(bad ? { unverifiedRuns: [...bad] } : {}),
    });
  }
  return out.sort((a, b) => serialOrder(a.unit, b.unit));
}

// compareSerials (unitSummaries.ts) with one collator made once: localeCompare with options builds
// a collator on every call, which dominated a listing of 2 000 units. Same options, same order.
const SERIALS = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });
function serialOrder(a: string, b: string): number {
  return SERIALS.compare(a, b) || (a < b ? -1 : a > b ? 1 : 0);
}
