/**
 * Reading runs back. Every run read is re-hashed and compared with the digest stored with it, so a
 * record changed behind benchproof's back is shown as such (`intact: false`) rather than believed.
 * A row whose stored JSON does not parse or is not the shape benchproof stores is not a run: it is
 * returned as damaged, naming its number, and the other runs stay readable.
 */
import type { Database } from 'better-sqlite3';
import type { AttemptReason, RunKind, Statement, StoredCapture, StoredRun } from '../types/index.js';
import { CanonicalText, runDigest, sha256Hex } from './digest.js';
import { parseDiagnosis, parseVerdict } from './rowShape.js';
import type { SummaryHeadRow } from './runSummary.js';

/** A run row as stored: the columns its summary is fingerprinted with (attempt columns NULL before schema 5), and its texts. */
export interface RunRow extends SummaryHeadRow {
  verdict_json: string;
  diagnosis_json: string;
}

interface CaptureRow {
  run_id: number;
  sha256: string;
  original_path: string;
  size: number;
  layout: string;
  condition: string;
  file: string;
}

export interface RunFilter {
  readonly unit?: string;
  readonly spec?: string;
}

/** A stored row that could not be read as what it should be. */
export interface DamagedRow {
  readonly kind: 'run' | 'calibration';
  readonly id: number;
  readonly unit: string;
  readonly problem: string;
}

export interface RunsRead {
  readonly runs: StoredRun[];
  readonly damaged: DamagedRow[];
}

/** Runs oldest first (by start time, then run number), optionally for one unit or one spec name. */
export function readRuns(db: Database, filter: RunFilter = {}): StoredRun[] {
  return readRunRows(db, filter).runs;
}

/** As readRuns, with the rows that could not be read as runs beside them. */
export function readRunRows(db: Database, filter: RunFilter = {}): RunsRead {
  const where: string[] = [];
  const args: string[] = [];
  if (filter.unit !== undefined) {
    where.push('unit = ?');
    args.push(filter.unit);
  }
  if (filter.spec !== undefined) {
    where.push('spec_name = ?');
    args.push(filter.spec);
  }
  const sql = `SELECT * FROM runs ${where.length ? `WHERE ${where.join(' AND ')}` : ''} ORDER BY started_at, id`;
  const rows = db.prepare(sql).all(...args) as RunRow[];
  const captures = capturesByRun(db, rows);
  const runs: StoredRun[] = [];
  const damaged: DamagedRow[] = [];
  for (const row of rows) {
    const run = toStoredRun(row, captures.get(row.id) ?? []);
    if ('problem' in run) damaged.push(run);
    else runs.push(run);
  }
  return { runs, damaged };
}

/** The archived captures of these runs, by run, in their order (one query). */
export function capturesByRun(db: Database, runs: readonly { id: number }[]): Map<number, StoredCapture[]> {
  const out = new Map<number, StoredCapture[]>();
  if (runs.length === 0) return out;
  const rows = db
    .prepare(
      `SELECT rc.run_id, rc.sha256, rc.original_path, rc.size, rc.layout, rc.condition, b.file
       FROM run_captures rc JOIN blobs b ON b.sha256 = rc.sha256
       WHERE rc.run_id IN (SELECT value FROM json_each(?)) ORDER BY rc.run_id, rc.seq`,
    )
    .all(JSON.stringify(runs.map((r) => r.id))) as CaptureRow[];
  for (const r of rows) {
    const list = out.get(r.run_id) ?? [];
    list.push({ path: r.original_path, sha256: r.sha256, size: r.size, layout: r.layout, condition: r.condition, archivePath: r.file });
    out.set(r.run_id, list);
  }
  return out;
}

/** One stored row as a run, re-hashed against its digest (either engine's row). */
export function toStoredRun(row: RunRow, captures: readonly StoredCapture[]): StoredRun | DamagedRow {
  const verdict = parseVerdict(row.verdict_json);
  const diagnosis = parseDiagnosis(row.diagnosis_json);
  const unit = String(row.unit);
  if (!verdict.ok || !diagnosis.ok) return { kind: 'run', id: row.id, unit, problem: verdict.ok ? (diagnosis as { problem: string }).problem : verdict.problem };
  const run = {
    id: row.id,
    unit,
    kind: row.kind as RunKind,
    startedAt: String(row.started_at),
    storedAt: String(row.stored_at),
    operator: String(row.operator),
    station: String(row.station),
    spec: { name: String(row.spec_name), revision: String(row.spec_revision), sha256: String(row.spec_sha256) },
    toolVersion: String(row.tool_version),
    statement: row.statement as Statement,
    verdict: verdict.value,
    diagnosis: diagnosis.value,
    captures,
    digest: String(row.digest),
    ...attemptColumns(row),
  };
  const intact = runDigest(run) === row.digest && run.verdict.statement === run.statement && run.verdict.unit === run.unit;
  return { ...run, intact };
}

/** What verifying a run needs: its fingerprint, whether the row still matches it, and its captures. */
export interface RunDigestRow {
  readonly id: number;
  readonly unit: string;
  readonly digest: string;
  readonly intact: boolean;
  readonly captures: readonly StoredCapture[];
  /** What disagrees between the run row and its summary (schema 7), when something does. */
  readonly summaryProblem?: string;
}

/**
 * Every run's fingerprint checked without building the run: the stored verdict and diagnosis are
 * canonical JSON (saveRun), so the fingerprint is recomputed over their text as stored, and the
 * statement and serial columns are compared with the verdict's by SQLite's JSON functions. A row
 * that does not match that way (stored before the texts were canonical, or changed) is read in full
 * and judged as readRuns judges it, so nothing is believed that readRuns would not believe.
 */
export function readRunDigests(db: Database, filter: RunFilter = {}, againstSummaries = false): { rows: RunDigestRow[]; damaged: DamagedRow[] } {
  const where = filter.unit !== undefined ? 'WHERE unit = ?' : '';
  // A unit read in full checks its verdicts against their summaries too (a second hash of each verdict:
  // worth it for one unit's runs, not for the whole store, whose audit checks every summary itself).
  const of = (column: string): string => (againstSummaries && hasSummaries(db) ? `(SELECT s.${column} FROM run_summaries s WHERE s.run_id = runs.id)` : 'NULL');
  const sql = `SELECT *, json_extract(verdict_json, '$.statement') AS verdict_statement, json_extract(verdict_json, '$.unit') AS verdict_unit,
    ${of('verdict_sha256')} AS summary_verdict_sha256, ${of('run_digest')} AS summary_run_digest
    FROM runs ${where} ORDER BY started_at, id`;
  let rows: DigestRow[];
  try {
    rows = db.prepare(sql).all(...(filter.unit !== undefined ? [filter.unit] : [])) as typeof rows;
  } catch {
    // A verdict that is not JSON at all stops json_extract: judge every row the slow way.
    const read = readRunRows(db, filter);
    return { rows: read.runs.map((r) => ({ id: r.id, unit: r.unit, digest: r.digest, intact: r.intact, captures: r.captures })), damaged: read.damaged };
  }
  return judgeDigestRows(rows, capturesByRun(db, rows));
}

/** Does this store have run summaries yet (schema 7)? */
function hasSummaries(db: Database): boolean {
  return db.prepare("SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = 'run_summaries'").get() !== undefined;
}

/** A run row with the verdict's own statement and serial taken out of its JSON by the engine, and its summary's verdict SHA-256. */
export type DigestRow = RunRow & { verdict_statement: unknown; verdict_unit: unknown; summary_verdict_sha256?: string | null; summary_run_digest?: string | null };

/** The run row against its summary's copies: its fingerprint (as the chain holds it) and its verdict's hash. */
function summaryProblemOf(row: DigestRow): string | undefined {
  if (typeof row.summary_run_digest === 'string' && row.summary_run_digest !== row.digest) return 'its fingerprint differs from the one the hash chain holds (it was edited and re-fingerprinted)';
  if (typeof row.summary_verdict_sha256 === 'string' && sha256Hex(String(row.verdict_json)) !== row.summary_verdict_sha256) return 'its verdict no longer hashes to the SHA-256 its summary holds';
  return undefined;
}

/** readRunDigests' judgement over rows either engine read: the fast fingerprint, else the full read. */
export function judgeDigestRows(rows: readonly DigestRow[], captures: ReadonlyMap<number, StoredCapture[]>): { rows: RunDigestRow[]; damaged: DamagedRow[] } {
  const out: RunDigestRow[] = [];
  const damaged: DamagedRow[] = [];
  for (const row of rows) {
    const caps = captures.get(row.id) ?? [];
    const unit = String(row.unit);
    const fast =
      row.verdict_statement === row.statement &&
      row.verdict_unit === row.unit &&
      runDigest({
        unit,
        kind: row.kind as RunKind,
        startedAt: String(row.started_at),
        operator: String(row.operator),
        station: String(row.station),
        spec: { name: String(row.spec_name), revision: String(row.spec_revision), sha256: String(row.spec_sha256) },
        toolVersion: String(row.tool_version),
        verdict: new CanonicalText(String(row.verdict_json)),
        diagnosis: new CanonicalText(String(row.diagnosis_json)),
        captures: caps,
        ...attemptColumns(row),
      }) === row.digest;
    // The full verdict is read here, so it is checked against its summary's copy of its hash too.
    const summaryProblem = summaryProblemOf(row);
    const extra = summaryProblem !== undefined ? { summaryProblem } : {};
    if (fast) {
      out.push({ id: row.id, unit, digest: String(row.digest), intact: true, captures: caps, ...extra });
      continue;
    }
    const run = toStoredRun(row, caps);
    if ('problem' in run) damaged.push(run);
    else out.push({ id: run.id, unit: run.unit, digest: run.digest, intact: run.intact, captures: run.captures, ...extra });
  }
  return { rows: out, damaged };
}

/** Distinct unit serials and spec names, sorted, for listings and "did you mean" hints. */
export function distinct(db: Database, column: 'unit' | 'spec_name'): string[] {
  const rows = db.prepare(`SELECT DISTINCT ${column} AS v FROM runs ORDER BY v`).all() as { v: string }[];
  return rows.map((r) => r.v);
}

/** The stored text of a spec, when it was given. */
export function specText(db: Database, sha256: string): string | undefined {
  const row = db.prepare('SELECT text FROM specs WHERE sha256 = ?').get(sha256) as { text: Buffer | null } | undefined;
  return row?.text ? Buffer.from(row.text).toString('utf8') : undefined;
}

/** The schema-5 columns of a run row, only where set (runs stored before keep their digest). */
function attemptColumns(row: RunRow): Pick<StoredRun, 'attempt' | 'attemptReason' | 'note'> {
  return {
    ...(typeof row.attempt === 'number' ? { attempt: row.attempt } : {}),
    ...(typeof row.attempt_reason === 'string' ? { attemptReason: row.attempt_reason as AttemptReason } : {}),
    ...(typeof row.note === 'string' ? { note: row.note } : {}),
  };
}
