/**
 * Reading runs back from the shared store: the same rows and the same check as the embedded store
 * (readRuns.ts's toStoredRun): every run is re-hashed and compared with its stored digest, a row
 * whose JSON does not parse is returned as damaged, and the other runs stay readable.
 */
import type { StoredCapture, StoredRun } from '../../types/index.js';
import { toStoredRun } from '../readRuns.js';
import type { RunFilter, RunRow, RunsRead } from '../readRuns.js';
import type { PgSyncClient } from './pgSync.js';

interface PgCaptureRow {
  run_id: number;
  sha256: string;
  original_path: string;
  /** bigint: the driver returns it as text. */
  size: string;
  layout: string;
  condition: string;
  file: string;
}

/** Runs oldest first (by start time, then run number), optionally for one unit or one spec name. */
export function pgReadRunRows(client: PgSyncClient, filter: RunFilter = {}): RunsRead {
  const where: string[] = [];
  const args: string[] = [];
  if (filter.unit !== undefined) where.push(`unit = $${args.push(filter.unit)}`);
  if (filter.spec !== undefined) where.push(`spec_name = $${args.push(filter.spec)}`);
  const rows = client.query<RunRow>(`SELECT * FROM runs ${where.length ? `WHERE ${where.join(' AND ')}` : ''} ORDER BY started_at, id`, args).rows;
  const captures = capturesByRun(client, rows.map((r) => r.id));
  const read: RunsRead = { runs: [], damaged: [] };
  for (const row of rows) {
    const run = toStoredRun(row, captures.get(row.id) ?? []);
    if ('problem' in run) read.damaged.push(run);
    else read.runs.push(run);
  }
  return read;
}

function capturesByRun(client: PgSyncClient, ids: readonly number[]): Map<number, StoredCapture[]> {
  const out = new Map<number, StoredCapture[]>();
  if (ids.length === 0) return out;
  const rows = client.query<PgCaptureRow>(
    `SELECT rc.run_id, rc.sha256, rc.original_path, rc.size, rc.layout, rc.condition, b.file
     FROM run_captures rc JOIN blobs b ON b.sha256 = rc.sha256
     WHERE rc.run_id = ANY($1::integer[]) ORDER BY rc.run_id, rc.seq`,
    [ids],
  ).rows;
  for (const r of rows) {
    const list = out.get(r.run_id) ?? [];
    list.push({ path: r.original_path, sha256: r.sha256, size: Number(r.size), layout: r.layout, condition: r.condition, archivePath: r.file });
    out.set(r.run_id, list);
  }
  return out;
}

/** The runs that read as runs (a damaged row is named by the audit instead). */
export function pgRunRows(client: PgSyncClient, filter: RunFilter = {}): StoredRun[] {
  return pgReadRunRows(client, filter).runs;
}
