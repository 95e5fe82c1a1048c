/**
 * Schema 7: a light summary beside every run (runSummary.ts), so `units` and `batch` read and verify a
 * few hundred bytes per run instead of hashing each full verdict. It repeats the run's fingerprint
 * and attempt columns (covered by its own fingerprint): in SQLite those columns lie after the verdict
 * text in the run's row, and reading them would read the whole verdict from its overflow pages. The
 * checks (a few kB) live in a table of their own, read only by `batch` and only for the runs its
 * statistics use, so the summaries a listing reads pack many to a page. The table is append-only like every
 * record table. Runs stored before this schema get their summary here, each only after its own
 * fingerprint is verified (the run re-hashed as a full read does); a run that fails it gets none, so
 * it stays named as changed by every listing instead of being vouched for by a new summary. Each
 * summary joins the hash chain after the entries already there, in run order.
 * The same step is applied to the shared store (pgSchema.ts) through `fillSummaries`.
 * Frozen: later changes go in a new numbered migration.
 */
import type { Database } from 'better-sqlite3';
import type { StoredCapture } from '../types/index.js';
import { appendLink } from './chain.js';
import { capturesByRun, toStoredRun } from './readRuns.js';
import type { RunRow } from './readRuns.js';
import { summarize } from './runSummary.js';
import type { SummaryValues } from './runSummary.js';
import { parseVerdict } from './rowShape.js';

const SUMMARY_SQL = `
CREATE TABLE run_summaries (
  run_id INTEGER PRIMARY KEY REFERENCES runs(id),
  run_digest TEXT NOT NULL,
  attempt INTEGER,
  attempt_reason TEXT,
  note TEXT,
  verdict_sha256 TEXT NOT NULL,
  checks_sha256 TEXT NOT NULL,
  state_json TEXT NOT NULL,
  digest TEXT NOT NULL
);
CREATE TABLE run_summary_checks (
  run_id INTEGER PRIMARY KEY REFERENCES run_summaries(run_id),
  checks_json TEXT NOT NULL
);
${['run_summaries', 'run_summary_checks'].map((table) => {
  const abort = `SELECT RAISE(ABORT, 'benchproof records are append-only: ${table} rows are never changed or removed');`;
  return `CREATE TRIGGER ${table}_no_update BEFORE UPDATE ON ${table} BEGIN ${abort} END;
CREATE TRIGGER ${table}_no_delete BEFORE DELETE ON ${table} BEGIN ${abort} END;`;
}).join('\n')}
`;

/** Runs read per page while filling, so a large store is never held in memory at once. */
const PAGE = 200;

export function migrateTo7(db: Database): void {
  db.exec(SUMMARY_SQL);
  fillSummaries(
    (after) => {
      const rows = db.prepare('SELECT * FROM runs WHERE id > ? ORDER BY id LIMIT ?').all(after, PAGE) as RunRow[];
      return { rows, captures: capturesByRun(db, rows) };
    },
    (runId, s) => {
      insertSummary(db, runId, s);
      appendLink(db, 'summary', runId, s.digest);
    },
  );
}

/** Write one run's summary row (SQLite); the caller appends its chain entry in the same transaction. */
export function insertSummary(db: Database, runId: number, s: SummaryValues): void {
  db.prepare(`INSERT INTO run_summaries (run_id, run_digest, attempt, attempt_reason, note, verdict_sha256, checks_sha256, state_json, digest)
    VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`).run(runId, s.runDigest, s.attempt, s.attemptReason, s.note, s.verdictSha256, s.checksSha256, s.stateJson, s.digest);
  db.prepare('INSERT INTO run_summary_checks (run_id, checks_json) VALUES (?, ?)').run(runId, s.checksJson);
}

/**
 * Summaries for the runs of an older store, page by page in run order, either engine: each run is
 * re-hashed against its fingerprint first and summarised only when it holds. Returns how many runs
 * were summarised and which were left without one.
 */
export function fillSummaries(
  page: (afterId: number) => { rows: RunRow[]; captures: ReadonlyMap<number, StoredCapture[]> },
  write: (runId: number, summary: SummaryValues) => void,
): { summarised: number; skipped: number[] } {
  let after = 0;
  let summarised = 0;
  const skipped: number[] = [];
  for (;;) {
    const { rows, captures } = page(after);
    if (rows.length === 0) return { summarised, skipped };
    for (const row of rows) {
      after = Number(row.id);
      const run = toStoredRun(row, captures.get(row.id) ?? []);
      const verdict = parseVerdict(row.verdict_json);
      if ('problem' in run || !run.intact || !verdict.ok) {
        skipped.push(after);
        continue;
      }
      write(after, summarize(row, verdict.value, String(row.verdict_json)));
      summarised += 1;
    }
  }
}
