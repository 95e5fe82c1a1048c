/**
 * Storing one calibration iteration in the shared store: the rule of calibrationSave.ts (an
 * iteration continues the unit's latest calibration run unless that run is complete, the spec text
 * changed, or a new run is asked for), the same fingerprint, its chain link and its capture bytes,
 * all in one transaction under the store-wide write lock (pgSaveRun.ts), so two benches calibrating
 * the same unit at once number their iterations one after the other.
 */
import { readFileSync } from 'node:fs';
import type { NewCalibrationIteration, StoredCapture } from '../../types/index.js';
import { BenchError } from '../../types/index.js';
import { archiveName } from '../archive.js';
import { iterationDigest } from '../calibrationDigest.js';
import type { SavedIteration } from '../calibrationSave.js';
import { sha256Hex } from '../digest.js';
import { putCapture } from './pgCaptures.js';
import { WRITE_LOCK, insertRows, pgAppendLink } from './pgSaveRun.js';
import type { RunOrigin } from './pgSaveRun.js';
import type { PgSyncClient } from './pgSync.js';

export function pgSaveCalibration(client: PgSyncClient, it: NewCalibrationIteration, origin: RunOrigin = {}): SavedIteration {
  if (typeof it.unit !== 'string' || it.unit.trim() === '') throw new TypeError(`saveCalibration: unit serial is empty (${JSON.stringify(it.unit)})`);
  if (it.result.unit !== it.unit) throw new RangeError(`saveCalibration: result is for unit ${it.result.unit}, iteration is for ${it.unit}`);
  if (it.spec.text !== undefined && sha256Hex(it.spec.text) !== it.spec.sha256) throw new RangeError(`saveCalibration: spec.text hashes to ${sha256Hex(it.spec.text)}, not spec.sha256 ${it.spec.sha256}`);
  const bytes = it.captures.map((c) => {
    const b = c.bytes ? Buffer.from(c.bytes) : readFileSync(c.sourcePath as string);
    if (sha256Hex(b) !== c.sha256) throw changed(c.path, sha256Hex(b), c.sha256);
    return b;
  });
  const captures: StoredCapture[] = it.captures.map((c, i) => ({ path: c.path, sha256: c.sha256, size: c.size, layout: c.layout, condition: c.condition, archivePath: archiveName(c.sha256, bytes[i]) }));
  const startedAt = new Date(it.startedAt).toISOString();
  const spec = { name: it.spec.name, revision: it.spec.revision, sha256: it.spec.sha256 };
  const base = { unit: it.unit, startedAt, operator: it.operator, station: it.station, spec, toolVersion: it.toolVersion, result: it.result, captures };
  const digest = iterationDigest(base);
  return client.transaction((): SavedIteration => {
    client.query('SELECT pg_advisory_xact_lock($1)', [WRITE_LOCK]);
    if (origin.uid !== undefined) {
      const found = client.query<{ id: number }>('SELECT id FROM calibration_iterations WHERE origin_uid = $1', [origin.uid]).rows[0];
      if (found) return storedIteration(client, found.id, base);
    }
    const storedAt = new Date().toISOString();
    const text = it.spec.text === undefined ? null : Buffer.from(it.spec.text);
    client.query('INSERT INTO specs (sha256, name, revision, text) VALUES ($1, $2, $3, $4) ON CONFLICT (sha256) DO NOTHING', [spec.sha256, spec.name, spec.revision, text]);
    if (text) client.query('UPDATE specs SET text = $1 WHERE sha256 = $2 AND text IS NULL', [text, spec.sha256]);
    const open = it.newRun ? undefined : openRun(client, it.unit, spec.sha256);
    const calibrationId =
      open?.id ??
      client.query<{ id: number }>('INSERT INTO calibration_runs (unit, spec_name, spec_revision, spec_sha256, started_at) VALUES ($1, $2, $3, $4, $5) RETURNING id', [it.unit, spec.name, spec.revision, spec.sha256, startedAt]).rows[0].id;
    const number = (open?.last ?? 0) + 1;
    const id = client.query<{ id: number }>(
      `INSERT INTO calibration_iterations (calibration_id, number, started_at, stored_at, operator, station, tool_version, statement, meets_limits, result_json, digest, origin_uid, origin_digest)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13) RETURNING id`,
      [calibrationId, number, startedAt, storedAt, it.operator, it.station, it.toolVersion, it.result.statement, it.result.meetsLimits ? 1 : 0, JSON.stringify(it.result), digest, origin.uid ?? null, origin.digest ?? null],
    ).rows[0].id;
    pgAppendLink(client, 'calibration', id, digest);
    bytes.forEach((b, i) => putCapture(client, b, captures[i].archivePath, storedAt));
    insertRows(client, 'calibration_captures (iteration_id, seq, sha256, original_path, size, layout, step)', captures.map((c, i) => [id, i, c.sha256, c.path, c.size, c.layout, c.condition]));
    const { unit: _unit, spec: _spec, ...rest } = base;
    return { calibrationId, startedRun: open === undefined, iteration: { id, number, storedAt, digest, intact: true, ...rest } };
  });
}

function openRun(client: PgSyncClient, unit: string, specSha: string): { id: number; last: number } | undefined {
  const run = client.query<{ id: number; spec_sha256: string }>('SELECT id, spec_sha256 FROM calibration_runs WHERE unit = $1 ORDER BY id DESC LIMIT 1', [unit]).rows[0];
  if (!run || run.spec_sha256 !== specSha) return undefined;
  const last = client.query<{ number: number; meets_limits: number }>('SELECT number, meets_limits FROM calibration_iterations WHERE calibration_id = $1 ORDER BY number DESC LIMIT 1', [run.id]).rows[0];
  if (!last || last.meets_limits === 1) return undefined;
  return { id: run.id, last: last.number };
}

/** An iteration pushed before, as it was stored then. */
function storedIteration(client: PgSyncClient, id: number, base: { startedAt: string; operator: string; station: string; toolVersion: string; result: NewCalibrationIteration['result']; captures: StoredCapture[] }): SavedIteration {
  const row = client.query<{ calibration_id: number; number: number; stored_at: string; digest: string }>('SELECT calibration_id, number, stored_at, digest FROM calibration_iterations WHERE id = $1', [id]).rows[0];
  const first = client.query<{ n: number }>('SELECT MIN(number) AS n FROM calibration_iterations WHERE calibration_id = $1', [row.calibration_id]).rows[0].n;
  const { startedAt, operator, station, toolVersion, result, captures } = base;
  return { calibrationId: row.calibration_id, startedRun: first === row.number, iteration: { id, number: row.number, storedAt: row.stored_at, digest: row.digest, intact: true, startedAt, operator, station, toolVersion, result, captures } };
}

function changed(path: string, now: string, was: string): BenchError {
  return new BenchError({
    code: 'records.capture-changed',
    file: path,
    problem: `the capture's bytes now hash to ${now.slice(0, 12)}…, not ${was.slice(0, 12)}… as when it was measured; nothing was stored`,
    expected: 'a capture file that stays unchanged while benchproof checks it',
    fix: 'wait until the scope or copy tool has finished writing the file, then run the check again',
  });
}
