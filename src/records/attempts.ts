/**
 * Test attempts: the captures of one unit checked together until every condition the spec names is
 * present. An attempt is a group of runs (each run re-checks the attempt's captures so far, so its
 * latest run decides it). A new run continues the unit's latest attempt while that attempt still waits
 * for a condition, and opens the next one when the latest is complete, when the user asks for a new
 * one or gives a note (a repair, a trim), when the unit was calibrated since, or when the spec's name
 * differs. Runs stored before schema 5 carry no attempt number and are grouped here by the same rule,
 * so old records read as attempts without anything stored being changed.
 */
import type { Database } from 'better-sqlite3';
import { verdictState, waitingConditions } from '../types/index.js';
import type { AttemptReason, AttemptSummary, NewRun, StoredCapture, StoredRun } from '../types/index.js';
import { worstStatement } from '../design/index.js';

/** Where a new run goes: its attempt number, and why when it opens that attempt. */
export interface AttemptPlacement {
  readonly attempt: number;
  readonly attemptReason?: AttemptReason;
}

/** The unit's runs (oldest first) with attempt and per-unit run numbers filled in. */
export function numberRuns(runs: readonly StoredRun[]): StoredRun[] {
  const out: StoredRun[] = [];
  runs.forEach((run, i) => {
    // A run already numbered so (a listing's light runs: batchRuns.ts) is taken as it is, not copied.
    if (run.attempt !== undefined && run.number === i + 1) {
      out.push(run);
      return;
    }
    const prev = out[i - 1];
    const placed = run.attempt !== undefined ? { attempt: run.attempt, attemptReason: run.attemptReason } : replay(prev, run);
    out.push({ ...run, ...placed, number: i + 1 });
  });
  return out;
}

/** The rule for a run stored before attempts: continue a waiting attempt of the same spec, else open the next. */
function replay(prev: StoredRun | undefined, run: StoredRun): AttemptPlacement {
  if (!prev || prev.attempt === undefined) return { attempt: 1, attemptReason: 'first' };
  if (verdictState(prev.verdict) === 'complete') return { attempt: prev.attempt + 1, attemptReason: 'after-complete' };
  if (prev.spec.name !== run.spec.name) return { attempt: prev.attempt + 1, attemptReason: 'other-spec' };
  return { attempt: prev.attempt };
}

/** The attempts of one unit's numbered runs, oldest first. */
export function summarizeAttempts(numbered: readonly StoredRun[]): AttemptSummary[] {
  const groups = new Map<number, StoredRun[]>();
  for (const r of numbered) groups.set(r.attempt ?? 0, [...(groups.get(r.attempt ?? 0) ?? []), r]);
  const numbers = [...groups.keys()];
  return numbers.map((n) => {
    const runs = groups.get(n) ?? [];
    const last = runs[runs.length - 1];
    const waitingFor = waitingConditions(last.verdict);
    const state = waitingFor.length ? 'incomplete' : 'complete';
    const captured = last.verdict.conditions.filter((c) => !waitingFor.includes(c.condition));
    return {
      number: n,
      reason: runs[0].attemptReason ?? (n === 1 ? 'first' : 'after-complete'),
      state,
      statement: last.statement,
      soFar: last.verdict.soFar ?? worstStatement(captured.map((c) => c.statement)),
      waitingFor,
      closed: state === 'complete' || n !== numbers[numbers.length - 1],
      spec: last.spec,
      startedAt: runs[0].startedAt,
      lastAt: last.startedAt,
      runIds: runs.map((r) => r.id),
      notes: runs.flatMap((r) => (r.note ? [r.note] : [])),
      recaptures: countRecaptures(runs),
    };
  });
}

/** A condition whose capture bytes changed from one run of the attempt to the next was captured again. */
function countRecaptures(runs: readonly StoredRun[]): number {
  let count = 0;
  for (let i = 1; i < runs.length; i++) {
    for (const c of runs[i].captures) {
      const before = runs[i - 1].captures.find((p) => p.condition === c.condition);
      if (before && before.sha256 !== c.sha256) count += 1;
    }
  }
  return count;
}

/**
 * The attempt a new run of this unit goes into, decided inside the write transaction (so two writers
 * never open the same number twice). Reads the unit's runs to number its attempts as a record would.
 */
export function placeRun(db: Database, run: NewRun, numbered: readonly StoredRun[]): AttemptPlacement {
  return placeRunWith(sqliteCalibrationAt(db), run, numbered);
}

/** When the unit's latest calibration iteration was stored (ISO time), or null: the one thing placing reads besides the runs. */
export type CalibrationClock = (unit: string) => string | null;

const sqliteCalibrationAt = (db: Database): CalibrationClock => (unit) =>
  (db.prepare('SELECT MAX(i.stored_at) AS at FROM calibration_iterations i JOIN calibration_runs c ON c.id = i.calibration_id WHERE c.unit = ?').get(unit) as { at: string | null }).at;

/** placeRun for any engine: the same rule, with the latest calibration time read by the caller's engine. */
export function placeRunWith(calibratedAt: CalibrationClock, run: NewRun, numbered: readonly StoredRun[]): AttemptPlacement {
  const last = numbered[numbered.length - 1];
  if (!last || last.attempt === undefined) return { attempt: 1, attemptReason: 'first' };
  const next = (attemptReason: AttemptReason): AttemptPlacement => ({ attempt: (last.attempt ?? 0) + 1, attemptReason });
  if (run.newAttempt) return next('requested');
  if (run.note !== undefined) return next('note');
  const open = stillOpen(calibratedAt, last, run.spec.name);
  return open === true ? { attempt: last.attempt } : next(open);
}

/** True when the unit's latest attempt can take this run; else why a new one opens. */
function stillOpen(calibratedAt: CalibrationClock, last: StoredRun, specName: string): true | AttemptReason {
  if (verdictState(last.verdict) === 'complete') return 'after-complete';
  if (last.spec.name !== specName) return 'other-spec';
  const at = calibratedAt(last.unit);
  if (at !== null && at > last.storedAt) return 'after-calibration';
  return true;
}

/** The unit's open attempt under this spec name: its number and the captures of its latest run. */
export interface OpenAttempt {
  readonly number: number;
  readonly runId: number;
  readonly waitingFor: readonly string[];
  readonly captures: readonly StoredCapture[];
}

export function openAttempt(db: Database, numbered: readonly StoredRun[], specName: string): OpenAttempt | undefined {
  return openAttemptWith(sqliteCalibrationAt(db), numbered, specName, (runId) => runCaptures(db, runId));
}

/** openAttempt for any engine: the calibration clock and the run's captures read by the caller's engine. */
export function openAttemptWith(calibratedAt: CalibrationClock, numbered: readonly StoredRun[], specName: string, capturesOf: (runId: number) => StoredCapture[]): OpenAttempt | undefined {
  const last = numbered[numbered.length - 1];
  if (!last || last.attempt === undefined || stillOpen(calibratedAt, last, specName) !== true) return undefined;
  return { number: last.attempt, runId: last.id, waitingFor: waitingConditions(last.verdict), captures: capturesOf(last.id) };
}

/** What a listing shows of a unit's attempts: the latest one's state and the complete ones' statements. */
export interface AttemptFacts {
  readonly state: AttemptSummary['state'];
  readonly waitingFor: readonly string[];
  readonly attempts: number;
  readonly firstComplete?: AttemptSummary['statement'];
  readonly latestComplete?: AttemptSummary['statement'];
}

export function attemptFacts(attempts: readonly AttemptSummary[]): AttemptFacts {
  const latest = attempts[attempts.length - 1];
  const complete = attempts.filter((a) => a.state === 'complete');
  return {
    state: latest.state,
    waitingFor: latest.waitingFor,
    attempts: attempts.length,
    ...(complete.length ? { firstComplete: complete[0].statement, latestComplete: complete[complete.length - 1].statement } : {}),
  };
}

export interface HeadRow {
  id: number;
  unit: string;
  spec_name: string;
  spec_revision: string;
  spec_sha256: string;
  started_at: string;
  stored_at: string;
  statement: string;
  attempt: number | null;
  attempt_reason: string | null;
  note: string | null;
  waiting_json: string | null;
  captured_json: string;
  conditions_json: string;
}

/**
 * The unit's runs, oldest first, with only what placing a new run needs: spec, times, attempt
 * columns and which conditions each verdict holds (taken out of the stored JSON by SQLite, so the
 * measurement reports with their plot data are not parsed). Verdicts here hold only that.
 */
export function readRunHeads(db: Database, unit: string): StoredRun[] {
  const rows = db
    .prepare(
      `SELECT id, unit, spec_name, spec_revision, spec_sha256, started_at, stored_at, statement, attempt, attempt_reason, note,
         json_extract(verdict_json, '$.waitingFor') AS waiting_json,
         (SELECT json_group_array(json_extract(c.value, '$.condition')) FROM json_each(verdict_json, '$.captures') c) AS captured_json,
         (SELECT json_group_array(json_extract(c.value, '$.condition')) FROM json_each(verdict_json, '$.conditions') c) AS conditions_json
       FROM runs WHERE unit = ? AND json_valid(verdict_json) ORDER BY started_at, id`,
    )
    .all(unit) as HeadRow[];
  return rows.map(runHead);
}

/** One row of a run-heads query (either engine) as the light StoredRun placing a run needs. */
export function runHead(r: HeadRow): StoredRun {
  const waitingFor = r.waiting_json === null ? undefined : (JSON.parse(r.waiting_json) as string[]);
  const verdict = {
    conditions: (JSON.parse(r.conditions_json) as string[]).map((condition) => ({ condition })),
    captures: (JSON.parse(r.captured_json) as string[]).map((condition) => ({ condition })),
    ...(waitingFor ? { waitingFor } : {}),
  };
  return {
    id: r.id,
    unit: r.unit,
    spec: { name: r.spec_name, revision: r.spec_revision, sha256: r.spec_sha256 },
    startedAt: r.started_at,
    storedAt: r.stored_at,
    statement: r.statement,
    verdict,
    captures: [],
    ...(r.attempt !== null ? { attempt: r.attempt } : {}),
    ...(r.attempt_reason !== null ? { attemptReason: r.attempt_reason } : {}),
    ...(r.note !== null ? { note: r.note } : {}),
  } as unknown as StoredRun;
}

/** The archived captures of one run, in their order. */
export function runCaptures(db: Database, runId: number): StoredCapture[] {
  const rows = db
    .prepare(
      `SELECT rc.sha256, rc.original_path, rc.size, rc.layout, rc.condition, b.file
       FROM run_captures rc JOIN blobs b ON b.sha256 = rc.sha256 WHERE rc.run_id = ? ORDER BY rc.seq`,
    )
    .all(runId) as { sha256: string; original_path: string; size: number; layout: string; condition: string; file: string }[];
  return rows.map((r) => ({ path: r.original_path, sha256: r.sha256, size: r.size, layout: r.layout, condition: r.condition, archivePath: r.file }));
}
