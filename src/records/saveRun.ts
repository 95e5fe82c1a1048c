/**
 * Storing one run. Captures are archived first (content-addressed, idempotent, so an interruption there
 * leaves at most an unreferenced copy); then every row of the run is written in one immediate
 * transaction, so the run is either there in full or not at all, together with its entry in the
 * hash chain (chain.ts).
 */
import type { Database } from 'better-sqlite3';
import type { NewRun, StoredCapture, StoredRun } from '../types/index.js';
import { archiveCapture } from './archive.js';
import { CanonicalText, canonicalJson, runDigest, sha256Hex } from './digest.js';
import { insertMeasurements } from './measurementRows.js';
import { numberRuns, placeRun } from './attempts.js';
import { readSummaryHeads } from './summaryReads.js';
import type { AttemptPlacement } from './attempts.js';
import { appendLink } from './chain.js';
import { queueOutbox } from './outboxQueue.js';
import { summarize } from './runSummary.js';
import type { SummaryHeadRow } from './runSummary.js';
import { insertSummary } from './migration7.js';

/** How a save is made besides the run itself. */
export interface SaveHooks {
  /** Fault injection for tests: called inside the transaction after every row is written, before commit. */
  readonly beforeCommit?: () => void;
  /**
   * The id this bench made for the run. The shared store stores a run with a known id once (a second
   * save returns the first); the embedded store keeps it in its outbox when `outbox` is set.
   */
  readonly uid?: string;
  /** Embedded store: the run is stored here because the shared store could not be reached (outbox.ts). */
  readonly outbox?: boolean;
  /** Shared store: the run's fingerprint in the store of the bench it was pushed from. */
  readonly originDigest?: string;
}

export function saveRun(db: Database, dataDir: string, run: NewRun, hooks: SaveHooks = {}): StoredRun {
  checkNewRun(run);
  const captures: StoredCapture[] = run.captures.map((c) => ({
    path: c.path,
    sha256: c.sha256,
    size: c.size,
    layout: c.layout,
    condition: c.condition,
    archivePath: archiveCapture(dataDir, c),
  }));
  const base = runBase(run, captures);
  const write = db.transaction((): StoredRun => {
    const storedAt = new Date().toISOString();
    // The attempt is decided inside the transaction, and the run's fingerprint covers it and the note.
    const numbered = numberRuns(readSummaryHeads(db, run.unit));
    const placed = { ...placeRun(db, run, numbered), ...(run.note !== undefined ? { note: run.note } : {}) };
    // Each text is written once: the fingerprint hashes the same canonical text the row stores.
    const verdictText = canonicalJson(run.verdict);
    const diagnosisText = canonicalJson(run.diagnosis);
    const digest = runDigest({ ...base, ...placed, verdict: new CanonicalText(verdictText), diagnosis: new CanonicalText(diagnosisText) });
    const id = insertRunRows(db, { ...run, startedAt: base.startedAt }, digest, storedAt, captures, placed, verdictText, diagnosisText);
    // The run joins the hash chain in the same transaction: stored and chained, or neither; its summary after it.
    appendLink(db, 'run', id, digest);
    const summary = summarize(summaryHead(id, { ...run, startedAt: base.startedAt }, storedAt, placed, digest), run.verdict, verdictText);
    insertSummary(db, id, summary);
    appendLink(db, 'summary', id, summary.digest);
    if (hooks.outbox) queueOutbox(db, 'run', id, hooks.uid, storedAt);
    hooks.beforeCommit?.();
    return { id, storedAt, digest, intact: true, ...base, ...placed, number: numbered.length + 1 };
  });
  return write.immediate();
}

/** The run row's columns as its summary is fingerprinted with them (runSummary.ts), either engine. */
export function summaryHead(id: number, run: NewRun, storedAt: string, placed: AttemptPlacement & { note?: string }, digest: string): SummaryHeadRow {
  return {
    id,
    unit: run.unit,
    kind: run.kind ?? 'check',
    started_at: run.startedAt,
    stored_at: storedAt,
    operator: run.operator,
    station: run.station,
    spec_name: run.spec.name,
    spec_revision: run.spec.revision,
    spec_sha256: run.spec.sha256,
    tool_version: run.toolVersion,
    statement: run.verdict.statement,
    attempt: placed.attempt,
    attempt_reason: placed.attemptReason ?? null,
    note: placed.note ?? null,
    digest,
  };
}

/** What a stored run holds before it is placed in an attempt, the same for either engine. */
export function runBase(run: NewRun, captures: readonly StoredCapture[]) {
  return {
    unit: run.unit,
    kind: run.kind ?? 'check',
    // Normalised to UTC so stored times sort as text; the instant is unchanged.
    startedAt: new Date(run.startedAt).toISOString(),
    operator: run.operator,
    station: run.station,
    spec: { name: run.spec.name, revision: run.spec.revision, sha256: run.spec.sha256 },
    toolVersion: run.toolVersion,
    statement: run.verdict.statement,
    verdict: run.verdict,
    diagnosis: run.diagnosis,
    captures,
  } as const;
}

function insertRunRows(db: Database, run: NewRun, digest: string, storedAt: string, captures: readonly StoredCapture[], placed: AttemptPlacement & { note?: string }, verdictText: string, diagnosisText: string): number {
  const { spec, verdict } = run;
  const text = spec.text === undefined ? null : Buffer.from(spec.text);
  db.prepare('INSERT OR IGNORE INTO specs (sha256, name, revision, text) VALUES (?, ?, ?, ?)').run(spec.sha256, spec.name, spec.revision, text);
  if (text) db.prepare('UPDATE specs SET text = ? WHERE sha256 = ? AND text IS NULL').run(text, spec.sha256);
  const info = db
    .prepare(
      `INSERT INTO runs (unit, kind, started_at, stored_at, operator, station, spec_name, spec_revision, spec_sha256,
        tool_version, decision_rule, statement, verdict_json, diagnosis_json, digest, attempt, attempt_reason, note)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    )
    .run(run.unit, run.kind ?? 'check', run.startedAt, storedAt, run.operator, run.station, spec.name, spec.revision, spec.sha256,
      run.toolVersion, verdict.decisionRule, verdict.statement, verdictText, diagnosisText, digest,
      placed.attempt, placed.attemptReason ?? null, placed.note ?? null);
  const runId = Number(info.lastInsertRowid);
  const cond = db.prepare('INSERT INTO condition_results (run_id, condition, statement) VALUES (?, ?, ?)');
  const check = db.prepare(`INSERT INTO checks (run_id, seq, condition, output, measurement, unit, value, expanded_uncertainty,
    lower, upper, nominal, guard, margin, statement, note) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`);
  let seq = 0;
  for (const c of verdict.conditions) {
    cond.run(runId, c.condition, c.statement);
    for (const k of c.checks) {
      check.run(runId, seq++, k.condition, k.output, k.measurement, k.unit, k.value, k.expandedUncertainty, k.lower, k.upper,
        k.nominal, k.guard, k.margin, k.statement, k.note ?? null);
    }
  }
  const cause = db.prepare('INSERT INTO causes (run_id, rank, cause_id, title, score, evidence_json, confirm) VALUES (?, ?, ?, ?, ?, ?, ?)');
  run.diagnosis.causes.forEach((c, i) => cause.run(runId, i + 1, c.id, c.title, c.score, JSON.stringify(c.evidence), c.confirm));
  const blob = db.prepare('INSERT OR IGNORE INTO blobs (sha256, size, file, first_stored_at) VALUES (?, ?, ?, ?)');
  const link = db.prepare('INSERT INTO run_captures (run_id, seq, sha256, original_path, size, layout, condition) VALUES (?, ?, ?, ?, ?, ?, ?)');
  captures.forEach((c, i) => {
    blob.run(c.sha256, c.size, c.archivePath, storedAt);
    link.run(runId, i, c.sha256, c.path, c.size, c.layout, c.condition);
  });
  insertMeasurements(db, runId, verdict);
  return runId;
}

/** Caller bugs (a run that does not hang together) throw at once, quoting the bad value. */
function checkNewRun(run: NewRun): void {
  if (typeof run.unit !== 'string' || run.unit.trim() === '') throw new TypeError(`saveRun: unit serial is empty (${JSON.stringify(run.unit)})`);
  if (run.verdict.unit !== run.unit) throw new RangeError(`saveRun: verdict is for unit ${run.verdict.unit}, run is for ${run.unit}`);
  if (Number.isNaN(Date.parse(run.startedAt))) throw new RangeError(`saveRun: startedAt ${JSON.stringify(run.startedAt)} is not an ISO 8601 time`);
  if (!/^[0-9a-f]{64}$/.test(run.spec.sha256)) throw new RangeError(`saveRun: spec.sha256 ${JSON.stringify(run.spec.sha256)} is not a SHA-256 hex digest`);
  if (run.spec.text !== undefined && sha256Hex(run.spec.text) !== run.spec.sha256) {
    throw new RangeError(`saveRun: spec.text hashes to ${sha256Hex(run.spec.text)}, not spec.sha256 ${run.spec.sha256}; pass the exact text (or bytes) that was hashed`);
  }
  for (const c of run.captures) {
    if (!/^[0-9a-f]{64}$/.test(c.sha256)) throw new RangeError(`saveRun: capture ${c.path} sha256 ${JSON.stringify(c.sha256)} is not a SHA-256 hex digest`);
  }
}
