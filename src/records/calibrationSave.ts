/**
 * Storing one calibration iteration. Captures are archived first (content-addressed, idempotent);
 * then, in one immediate transaction, the iteration joins the unit's open calibration run or starts a
 * new one, and every row is written, so an iteration is either there in full or not at all.
 * Grouping: an iteration continues the unit's latest calibration run unless that run is complete (an
 * iteration met the limits), the spec text changed (another SHA-256), or the caller asks for a new run.
 */
import type { Database } from 'better-sqlite3';
import type { NewCalibrationIteration, StoredCapture, StoredCalibrationIteration } from '../types/index.js';
import { archiveCapture } from './archive.js';
import { iterationDigest } from './calibrationDigest.js';
import { sha256Hex } from './digest.js';
import { appendLink } from './chain.js';
import { queueOutbox } from './outboxQueue.js';
import type { SaveHooks } from './saveRun.js';

export interface SavedIteration {
  /** The calibration run it belongs to, and whether this iteration started it. */
  readonly calibrationId: number;
  readonly startedRun: boolean;
  readonly iteration: StoredCalibrationIteration;
}

export function saveCalibration(db: Database, dataDir: string, it: NewCalibrationIteration, hooks: SaveHooks = {}): SavedIteration {
  checkIteration(it);
  const captures: StoredCapture[] = it.captures.map((c) => ({ path: c.path, sha256: c.sha256, size: c.size, layout: c.layout, condition: c.condition, archivePath: archiveCapture(dataDir, c) }));
  const startedAt = new Date(it.startedAt).toISOString();
  const spec = { name: it.spec.name, revision: it.spec.revision, sha256: it.spec.sha256 };
  const base = { unit: it.unit, startedAt, operator: it.operator, station: it.station, spec, toolVersion: it.toolVersion, result: it.result, captures };
  const digest = iterationDigest(base);
  const write = db.transaction((): SavedIteration => {
    const storedAt = new Date().toISOString();
    keepSpec(db, it);
    const open = it.newRun ? undefined : openRun(db, it.unit, spec.sha256);
    const calibrationId = open?.id ?? insertRun(db, it.unit, spec, startedAt);
    const number = (open?.last ?? 0) + 1;
    const info = db
      .prepare(`INSERT INTO calibration_iterations (calibration_id, number, started_at, stored_at, operator, station, tool_version, statement, meets_limits, result_json, digest)
        VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`)
      .run(calibrationId, number, startedAt, storedAt, it.operator, it.station, it.toolVersion, it.result.statement, it.result.meetsLimits ? 1 : 0, JSON.stringify(it.result), digest);
    const id = Number(info.lastInsertRowid);
    appendLink(db, 'calibration', id, digest);
    if (hooks.outbox) queueOutbox(db, 'calibration', id, hooks.uid, storedAt);
    const blob = db.prepare('INSERT OR IGNORE INTO blobs (sha256, size, file, first_stored_at) VALUES (?, ?, ?, ?)');
    const link = db.prepare('INSERT INTO calibration_captures (iteration_id, seq, sha256, original_path, size, layout, step) VALUES (?, ?, ?, ?, ?, ?, ?)');
    captures.forEach((c, i) => {
      blob.run(c.sha256, c.size, c.archivePath, storedAt);
      link.run(id, i, c.sha256, c.path, c.size, c.layout, c.condition);
    });
    const { unit: _unit, spec: _spec, ...rest } = base;
    return { calibrationId, startedRun: open === undefined, iteration: { id, number, storedAt, digest, intact: true, ...rest } };
  });
  return write.immediate();
}

function keepSpec(db: Database, it: NewCalibrationIteration): void {
  const text = it.spec.text === undefined ? null : Buffer.from(it.spec.text);
  db.prepare('INSERT OR IGNORE INTO specs (sha256, name, revision, text) VALUES (?, ?, ?, ?)').run(it.spec.sha256, it.spec.name, it.spec.revision, text);
  if (text) db.prepare('UPDATE specs SET text = ? WHERE sha256 = ? AND text IS NULL').run(text, it.spec.sha256);
}

/** The unit's latest calibration run when it is still open under the same spec text. */
function openRun(db: Database, unit: string, specSha: string): { id: number; last: number } | undefined {
  const run = db.prepare('SELECT id, spec_sha256 FROM calibration_runs WHERE unit = ? ORDER BY id DESC LIMIT 1').get(unit) as { id: number; spec_sha256: string } | undefined;
  if (!run || run.spec_sha256 !== specSha) return undefined;
  const last = db.prepare('SELECT number, meets_limits FROM calibration_iterations WHERE calibration_id = ? ORDER BY number DESC LIMIT 1').get(run.id) as { number: number; meets_limits: number } | undefined;
  if (!last || last.meets_limits === 1) return undefined;
  return { id: run.id, last: last.number };
}

function insertRun(db: Database, unit: string, spec: { name: string; revision: string; sha256: string }, startedAt: string): number {
  const info = db.prepare('INSERT INTO calibration_runs (unit, spec_name, spec_revision, spec_sha256, started_at) VALUES (?, ?, ?, ?, ?)').run(unit, spec.name, spec.revision, spec.sha256, startedAt);
  return Number(info.lastInsertRowid);
}

/** Caller bugs (an iteration that does not hang together) throw at once, quoting the bad value. */
function checkIteration(it: NewCalibrationIteration): void {
  if (typeof it.unit !== 'string' || it.unit.trim() === '') throw new TypeError(`saveCalibration: unit serial is empty (${JSON.stringify(it.unit)})`);
  if (it.result.unit !== it.unit) throw new RangeError(`saveCalibration: result is for unit ${it.result.unit}, iteration is for ${it.unit}`);
  if (Number.isNaN(Date.parse(it.startedAt))) throw new RangeError(`saveCalibration: startedAt ${JSON.stringify(it.startedAt)} is not an ISO 8601 time`);
  if (!/^[0-9a-f]{64}$/.test(it.spec.sha256)) throw new RangeError(`saveCalibration: spec.sha256 ${JSON.stringify(it.spec.sha256)} is not a SHA-256 hex digest`);
  if (it.spec.text !== undefined && sha256Hex(it.spec.text) !== it.spec.sha256) throw new RangeError(`saveCalibration: spec.text hashes to ${sha256Hex(it.spec.text)}, not spec.sha256 ${it.spec.sha256}`);
}
