/**
 * Writing one run to the shared store in two calls to the connection's worker instead of one per
 * statement: first everything placing the run reads (its origin id, its unit's run summaries, the
 * latest calibration, the chain head, which of its captures the store holds, and the run's number
 * from the runs' sequence), then every row it writes (new capture chunks, the spec, the run, its
 * checks, causes, capture links and measured values, its summary, and both chain links), in order.
 * Each call crosses to the worker thread once; on a busy machine that crossing, not the server,
 * was most of a check's store step (25 statements). The rows, fingerprints and links are the ones
 * saveRun.ts writes; the caller holds WRITE_LOCK inside one transaction, so nothing read in the
 * first call changes before the second.
 */
import type { NewRun, StoredRun, UnitVerdict } from '../../types/index.js';
import { CanonicalText, canonicalJson, runDigest } from '../digest.js';
import { numberRuns, placeRunWith } from '../attempts.js';
import { chainLink, CHAIN_START } from '../chain.js';
import { runBase, summaryHead } from '../saveRun.js';
import { summarize, SUMMARY_COLUMNS } from '../runSummary.js';
import type { SummaryRow, SummaryValues } from '../runSummary.js';
import { CHUNK_BYTES } from './pgCaptures.js';
import type { PgSyncClient } from './pgSync.js';
import type { PreparedRun, RunOrigin } from './pgSaveRun.js';
import { pgHeadsOf, storedRunById } from './pgSaveRun.js';

/** One statement of a batch. */
export interface Statement {
  readonly sql: string;
  readonly params?: readonly unknown[];
}

/**
 * Write a prepared run after `lead` (e.g. BEGIN and the write lock) and before `tail` (e.g. COMMIT),
 * all in the same two calls. `tailRan` is false when the run was found stored already (its origin
 * id), in which case nothing was written and the caller ends the transaction itself.
 */
export function writeRunBatched(client: PgSyncClient, prepared: PreparedRun, origin: RunOrigin, lead: readonly Statement[] = [], tail: readonly Statement[] = []): { run: StoredRun; tailRan: boolean } {
  const { run, bytes, captures } = prepared;
  const base = runBase(run, captures);
  const shas = [...new Set(captures.map((c) => c.sha256))];
  const [facts, heads, held] = client.batch([
    ...lead,
    {
      // nextval only when the run is new: a run pushed again takes no number.
      sql: `SELECT (SELECT id FROM runs WHERE origin_uid = $1) AS existing,
          CASE WHEN EXISTS (SELECT 1 FROM runs WHERE origin_uid = $1) THEN NULL ELSE nextval(pg_get_serial_sequence('runs', 'id'))::integer END AS next_id,
          (SELECT MAX(i.stored_at) FROM calibration_iterations i JOIN calibration_runs c ON c.id = i.calibration_id WHERE c.unit = $2) AS calibrated_at,
          (SELECT link FROM chain ORDER BY seq DESC LIMIT 1) AS head`,
      params: [origin.uid ?? null, run.unit],
    },
    { sql: `SELECT ${SUMMARY_COLUMNS} FROM runs r LEFT JOIN run_summaries s ON s.run_id = r.id WHERE r.unit = $1 ORDER BY r.started_at, r.id`, params: [run.unit] },
    { sql: 'SELECT sha256 FROM blobs WHERE sha256 = ANY($1::text[])', params: [shas] },
  ]).slice(lead.length);
  const f = facts.rows[0] as { existing: number | null; next_id: number | null; calibrated_at: string | null; head: string | null };
  if (f.existing !== null) return { run: storedRunById(client, f.existing), tailRan: false };
  const id = Number(f.next_id);
  const storedAt = new Date().toISOString();
  const numbered = numberRuns(pgHeadsOf(client, run.unit, heads.rows as unknown as SummaryRow[]));
  const placed = { ...placeRunWith(() => f.calibrated_at, run, numbered), ...(run.note !== undefined ? { note: run.note } : {}) };
  // Each text is written once: the fingerprint hashes the same canonical text the row stores.
  const verdictText = canonicalJson(run.verdict);
  const diagnosisText = canonicalJson(run.diagnosis);
  const digest = runDigest({ ...base, ...placed, verdict: new CanonicalText(verdictText), diagnosis: new CanonicalText(diagnosisText) });
  const normalised = { ...run, startedAt: base.startedAt };
  const summary = summarize(summaryHead(id, normalised, storedAt, placed, digest), run.verdict, verdictText);
  const runLink = chainLink(f.head ?? CHAIN_START, 'run', id, digest);
  const summaryLink = chainLink(runLink, 'summary', id, summary.digest);
  const stored = new Set(held.rows.map((r) => String(r.sha256)));
  const writes: Statement[] = [];
  captures.forEach((c, i) => {
    if (stored.has(c.sha256)) return;
    stored.add(c.sha256);
    writes.push(...captureStatements(bytes[i], c.sha256, c.archivePath, storedAt));
  });
  writes.push(
    ...runStatements(id, normalised, digest, storedAt, placed, origin, verdictText, diagnosisText),
    ...rowStatements('run_captures (run_id, seq, sha256, original_path, size, layout, condition)', captures.map((c, i) => [id, i, c.sha256, c.path, c.size, c.layout, c.condition])),
    ...rowStatements('measurements (run_id, capture_index, capture_sha256, channel_index, channel, measurement, value, uncertainty, unit, reason, method)', measurementRows(id, run.verdict)),
    { sql: 'INSERT INTO chain (kind, row_id, row_digest, link) VALUES ($1, $2, $3, $4)', params: ['run', id, digest, runLink] },
    summaryStatement(id, summary),
    { sql: 'INSERT INTO chain (kind, row_id, row_digest, link) VALUES ($1, $2, $3, $4)', params: ['summary', id, summary.digest, summaryLink] },
    ...tail,
  );
  client.batch(writes);
  return { run: { id, storedAt, digest, intact: true, ...base, ...placed, number: numbered.length + 1 }, tailRan: true };
}

/** A capture's bytes in chunks, unless the store holds them (checked in the first call, under the lock). */
function captureStatements(bytes: Buffer, sha256: string, file: string, storedAt: string): Statement[] {
  const out: Statement[] = [{ sql: 'INSERT INTO blobs (sha256, size, file, first_stored_at) VALUES ($1, $2, $3, $4) ON CONFLICT (sha256) DO NOTHING', params: [sha256, bytes.length, file, storedAt] }];
  for (let seq = 0, at = 0; at < bytes.length || seq === 0; seq++, at += CHUNK_BYTES) {
    out.push({ sql: 'INSERT INTO capture_chunks (sha256, seq, bytes) VALUES ($1, $2, $3) ON CONFLICT DO NOTHING', params: [sha256, seq, bytes.subarray(at, at + CHUNK_BYTES)] });
  }
  return out;
}

function runStatements(id: number, run: NewRun, digest: string, storedAt: string, placed: { attempt: number; attemptReason?: string; note?: string }, origin: RunOrigin, verdictText: string, diagnosisText: string): Statement[] {
  const { spec, verdict } = run;
  const text = spec.text === undefined ? null : Buffer.from(spec.text);
  const checks: unknown[][] = [];
  for (const c of verdict.conditions) {
    for (const k of c.checks) {
      checks.push([id, checks.length, k.condition, k.output, k.measurement, k.unit, k.value, k.expandedUncertainty, k.lower, k.upper, k.nominal, k.guard, k.margin, k.statement, k.note ?? null]);
    }
  }
  return [
    { sql: 'INSERT INTO specs (sha256, name, revision, text) VALUES ($1, $2, $3, $4) ON CONFLICT (sha256) DO NOTHING', params: [spec.sha256, spec.name, spec.revision, text] },
    ...(text ? [{ sql: 'UPDATE specs SET text = $1 WHERE sha256 = $2 AND text IS NULL', params: [text, spec.sha256] }] : []),
    {
      sql: `INSERT INTO runs (id, unit, kind, started_at, stored_at, operator, station, spec_name, spec_revision, spec_sha256,
          tool_version, decision_rule, statement, verdict_json, diagnosis_json, digest, attempt, attempt_reason, note, origin_uid, origin_digest)
        OVERRIDING SYSTEM VALUE VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15, $16, $17, $18, $19, $20, $21)`,
      params: [id, run.unit, run.kind ?? 'check', run.startedAt, storedAt, run.operator, run.station, spec.name, spec.revision, spec.sha256,
        run.toolVersion, verdict.decisionRule, verdict.statement, verdictText, diagnosisText, digest,
        placed.attempt, placed.attemptReason ?? null, placed.note ?? null, origin.uid ?? null, origin.digest ?? null],
    },
    ...rowStatements('condition_results (run_id, condition, statement)', verdict.conditions.map((c) => [id, c.condition, c.statement])),
    ...rowStatements('checks (run_id, seq, condition, output, measurement, unit, value, expanded_uncertainty, lower, upper, nominal, guard, margin, statement, note)', checks),
    ...rowStatements('causes (run_id, rank, cause_id, title, score, evidence_json, confirm)', run.diagnosis.causes.map((c, i) => [id, i + 1, c.id, c.title, c.score, JSON.stringify(c.evidence), c.confirm])),
  ];
}

/** The summary row and its checks in one statement. */
export function summaryStatement(runId: number, s: SummaryValues): Statement {
  return {
    sql: `WITH summary AS (
        INSERT INTO run_summaries (run_id, run_digest, attempt, attempt_reason, note, verdict_sha256, checks_sha256, state_json, digest)
        VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9) RETURNING run_id)
      INSERT INTO run_summary_checks (run_id, checks_json) SELECT run_id, $10 FROM summary`,
    params: [runId, s.runDigest, s.attempt, s.attemptReason, s.note, s.verdictSha256, s.checksSha256, s.stateJson, s.digest, s.checksJson],
  };
}

/** Up to 500 rows per INSERT statement. */
export function rowStatements(into: string, rows: readonly (readonly unknown[])[]): Statement[] {
  const out: Statement[] = [];
  for (let at = 0; at < rows.length; at += 500) {
    const params: unknown[] = [];
    const tuples = rows.slice(at, at + 500).map((r) => `(${r.map((v) => `$${params.push(v)}`).join(', ')})`);
    out.push({ sql: `INSERT INTO ${into} VALUES ${tuples.join(', ')}`, params });
  }
  return out;
}

function measurementRows(runId: number, verdict: UnitVerdict): unknown[][] {
  const rows: unknown[][] = [];
  verdict.captures.forEach((capture, ci) => {
    capture.report.channels.forEach((channel, chi) => {
      for (const [id, m] of Object.entries(channel.measurements)) {
        if (m) rows.push([runId, ci, capture.sha256, chi, channel.name, id, m.value, m.uncertainty, m.unit, m.reason ?? null, m.method ?? null]);
      }
    });
  });
  return rows;
}
