/**
 * Reading runs back. Every run read is re-hashed and compared with the digest stored with it, so a
 * record changed behind benchproof's back is shown as such (`intact: false`) rather than believed.
 */
import type { Database } from 'better-sqlite3';
import type { Diagnosis, RunKind, Statement, StoredCapture, StoredRun, UnitVerdict } from '../types/index.js';
import { runDigest } from './digest.js';

interface RunRow {
  id: number;
  unit: string;
  kind: string;
  started_at: string;
  stored_at: string;
  operator: string;
  station: string;
  spec_name: string;
  spec_revision: string;
  spec_sha256: string;
  tool_version: string;
  statement: string;
  verdict_json: string;
  diagnosis_json: string;
  digest: string;
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

/** Runs oldest first (by start time, then run number), optionally for one unit or one spec name. */
export function readRuns(db: Database, filter: RunFilter = {}): StoredRun[] {
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
  return rows.map((row) => toStoredRun(row, captures.get(row.id) ?? []));
}

function capturesByRun(db: Database, runs: readonly RunRow[]): Map<number, StoredCapture[]> {
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

function toStoredRun(row: RunRow, captures: readonly StoredCapture[]): StoredRun {
  const run = {
    id: row.id,
    unit: row.unit,
    kind: row.kind as RunKind,
    startedAt: row.started_at,
    storedAt: row.stored_at,
    operator: row.operator,
    station: row.station,
    spec: { name: row.spec_name, revision: row.spec_revision, sha256: row.spec_sha256 },
    toolVersion: row.tool_version,
    statement: row.statement as Statement,
    verdict: JSON.parse(row.verdict_json) as UnitVerdict,
    diagnosis: JSON.parse(row.diagnosis_json) as Diagnosis,
    captures,
    digest: row.digest,
  };
  const intact = runDigest(run) === row.digest && run.verdict.statement === run.statement && run.verdict.unit === run.unit;
  return { ...run, intact };
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
