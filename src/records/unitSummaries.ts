/** The unit listing and the per-unit record, built from stored runs. The latest run decides the status. */
import type { RunSpec, Statement, StoredRun, UnitRecord, UnitSummary } from '../types/index.js';
import { attemptFacts, numberRuns, summarizeAttempts } from './attempts.js';
import { S } from './runSummary.js';
import type { SummaryArray } from './runSummary.js';

/** Serials in natural order (FK-0099 before FK-0100). */
export function compareSerials(a: string, b: string): number {
  return SERIAL_ORDER.compare(a, b) || (a < b ? -1 : a > b ? 1 : 0);
}

// One collator for every comparison: localeCompare with options builds one per call (ECMA-402 §19.1.1),
// which made sorting 10 000 units' values take seconds.
const SERIAL_ORDER = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });

/**
 * Every unit (of one spec name, or all) with the state of its attempts, from the listing's rows as
 * read (arrays of SUMMARY_COLUMNS, oldest first within a unit): the first and latest run among that
 * spec's runs, attempts over all of the unit's runs, worked out from the attempt columns and condition
 * states as numberRuns, summarizeAttempts and attemptFacts work them out over light runs, without
 * making a run of each row. Rows whose state does not read are left out, as lightRuns leaves them (the
 * audit names them). test/records/listingFast.test.ts holds it equal to those functions composed.
 */
export function listUnitsFromRows(rows: readonly SummaryArray[], spec?: string): UnitSummary[] {
  const byUnit = new Map<string, SummaryArray[]>();
  let unit: string | undefined;
  let list: SummaryArray[] = [];
  for (const r of rows) {
    const u = String(r[S.unit]);
    if (u !== unit) {
      unit = u;
      const found = byUnit.get(u);
      if (found) list = found;
      else byUnit.set(u, (list = []));
    }
    list.push(r);
  }
  const out: UnitSummary[] = [];
  for (const [name, all] of byUnit) {
    const states = all.map(stateAt);
    const runs = all.filter((_, i) => states[i] !== undefined);
    const kept = states.filter((s): s is RowState => s !== undefined);
    const scoped = spec === undefined ? runs : runs.filter((r) => String(r[S.specName]) === spec);
    if (scoped.length === 0) continue;
    const first = scoped[0];
    const last = scoped[scoped.length - 1];
    out.push({
      unit: name,
      spec: specAt(last),
      status: String(last[S.statement]) as Statement,
      firstStatement: String(first[S.statement]) as Statement,
      firstTestedAt: String(first[S.startedAt]),
      lastTestedAt: String(last[S.startedAt]),
      runs: scoped.length,
      ...factsOf(runs, kept),
    });
  }
  return out.sort((a, b) => compareSerials(a.unit, b.unit));
}

/** What a listing needs of a run's summary state: the conditions it still waits for. */
interface RowState {
  readonly waitingFor: readonly string[];
}

/** The state of a row as lightRun reads it (undefined when it does not parse, as lightRun gives none). */
function stateAt(r: SummaryArray): RowState | undefined {
  if (r[S.stateJson] === null) return undefined;
  let state: { waitingFor?: readonly string[]; conditions?: readonly { condition: string }[] };
  try {
    state = JSON.parse(String(r[S.stateJson])) as typeof state;
  } catch {
    return undefined;
  }
  if (state === null || typeof state !== 'object' || !Array.isArray(state.conditions)) return undefined;
  // waitingConditions (types/verdict.ts) of the light verdict, which holds no captures.
  return { waitingFor: state.waitingFor ? state.waitingFor : state.conditions.map((c) => c.condition) };
}

function specAt(r: SummaryArray): RunSpec {
  return { name: String(r[S.specName]), revision: String(r[S.specRevision]), sha256: String(r[S.specSha256]) };
}

/** attemptFacts(summarizeAttempts(numberRuns(runs))) over the rows and their states. */
function factsOf(runs: readonly SummaryArray[], states: readonly RowState[]): ReturnType<typeof attemptFacts> {
  // Per attempt number, in order of first appearance: its last run's index.
  const lastOf = new Map<number, number>();
  let previous: number | undefined;
  runs.forEach((r, i) => {
    const stored = r[S.attempt];
    let attempt: number;
    if (typeof stored === 'number') attempt = stored;
    // numberRuns' replay for a run stored before attempts (attempts.ts).
    else if (previous === undefined) attempt = 1;
    else if (states[i - 1].waitingFor.length === 0 || String(runs[i - 1][S.specName]) !== String(r[S.specName])) attempt = previous + 1;
    else attempt = previous;
    lastOf.set(attempt, i);
    previous = attempt;
  });
  const attempts = [...lastOf.values()];
  const latest = attempts[attempts.length - 1];
  const complete = attempts.filter((i) => states[i].waitingFor.length === 0);
  return {
    state: states[latest].waitingFor.length ? 'incomplete' : 'complete',
    waitingFor: states[latest].waitingFor,
    attempts: attempts.length,
    ...(complete.length ? { firstComplete: String(runs[complete[0]][S.statement]) as Statement, latestComplete: String(runs[complete[complete.length - 1]][S.statement]) as Statement } : {}),
  };
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
