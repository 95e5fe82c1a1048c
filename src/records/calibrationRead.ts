/**
 * Reading calibration runs back, oldest first, each with its iterations in order. Every iteration is
 * re-hashed and compared with the digest stored with it, so a changed record shows as `intact: false`.
 */
import type { Database } from 'better-sqlite3';
import type { StoredCalibrationIteration, StoredCalibrationRun, StoredCapture, UnitRecord } from '../types/index.js';
import { iterationDigest } from './calibrationDigest.js';
import type { DamagedRow } from './readRuns.js';
import { parseIteration } from './rowShape.js';

export interface CalibrationRunRow {
  id: number;
  unit: string;
  spec_name: string;
  spec_revision: string;
  spec_sha256: string;
  started_at: string;
}

export interface IterationRow {
  id: number;
  calibration_id: number;
  number: number;
  started_at: string;
  stored_at: string;
  operator: string;
  station: string;
  tool_version: string;
  statement: string;
  meets_limits: number;
  result_json: string;
  digest: string;
}

export interface CalibrationCaptureRow {
  iteration_id: number;
  sha256: string;
  original_path: string;
  size: number;
  layout: string;
  step: string;
  file: string;
}

/** The unit's calibration runs with their readable iterations (a damaged iteration is left out). */
export function readCalibrations(db: Database, unit: string): StoredCalibrationRun[] {
  return readCalibrationRows(db, unit).runs;
}

/** Calibration runs (of one unit, or all), with the iterations that could not be read beside them. */
export function readCalibrationRows(db: Database, unit?: string): { runs: StoredCalibrationRun[]; damaged: DamagedRow[] } {
  const runs = (unit === undefined
    ? db.prepare('SELECT * FROM calibration_runs ORDER BY id').all()
    : db.prepare('SELECT * FROM calibration_runs WHERE unit = ? ORDER BY id').all(unit)) as CalibrationRunRow[];
  if (runs.length === 0) return { runs: [], damaged: [] };
  const ids = JSON.stringify(runs.map((r) => r.id));
  const iterations = db.prepare('SELECT * FROM calibration_iterations WHERE calibration_id IN (SELECT value FROM json_each(?)) ORDER BY calibration_id, number').all(ids) as IterationRow[];
  const captures = db
    .prepare(
      `SELECT cc.iteration_id, cc.sha256, cc.original_path, cc.size, cc.layout, cc.step, b.file
       FROM calibration_captures cc JOIN blobs b ON b.sha256 = cc.sha256
       WHERE cc.iteration_id IN (SELECT value FROM json_each(?)) ORDER BY cc.iteration_id, cc.seq`,
    )
    .all(JSON.stringify(iterations.map((i) => i.id))) as CalibrationCaptureRow[];
  return assembleCalibrations(runs, iterations, captures);
}

/** Calibration runs with their iterations from the rows either engine read (each iteration re-hashed). */
export function assembleCalibrations(runs: readonly CalibrationRunRow[], iterations: readonly IterationRow[], captures: readonly CalibrationCaptureRow[]): { runs: StoredCalibrationRun[]; damaged: DamagedRow[] } {
  const damaged: DamagedRow[] = [];
  const capturesOf = new Map<number, CalibrationCaptureRow[]>();
  for (const c of captures) capturesOf.set(c.iteration_id, [...(capturesOf.get(c.iteration_id) ?? []), c]);
  const iterationsOf = new Map<number, IterationRow[]>();
  for (const i of iterations) iterationsOf.set(i.calibration_id, [...(iterationsOf.get(i.calibration_id) ?? []), i]);
  const out = runs.map((run) => {
    const its: StoredCalibrationIteration[] = [];
    for (const row of iterationsOf.get(run.id) ?? []) {
      const it = toIteration(run, row, capturesOf.get(row.id) ?? []);
      if ('problem' in it) damaged.push(it);
      else its.push(it);
    }
    const spec = { name: run.spec_name, revision: run.spec_revision, sha256: run.spec_sha256 };
    return { id: run.id, unit: run.unit, spec, startedAt: run.started_at, complete: its.some((i) => i.result.meetsLimits), iterations: its };
  });
  return { runs: out, damaged };
}

function toIteration(run: CalibrationRunRow, row: IterationRow, rows: readonly CalibrationCaptureRow[]): StoredCalibrationIteration | DamagedRow {
  const captures: StoredCapture[] = rows.map((c) => ({ path: c.original_path, sha256: c.sha256, size: Number(c.size), layout: c.layout, condition: c.step, archivePath: c.file }));
  const parsed = parseIteration(row.result_json);
  if (!parsed.ok) return { kind: 'calibration', id: row.id, unit: String(run.unit), problem: parsed.problem };
  const result = parsed.value;
  const spec = { name: run.spec_name, revision: run.spec_revision, sha256: run.spec_sha256 };
  const base = { unit: run.unit, startedAt: row.started_at, operator: row.operator, station: row.station, spec, toolVersion: row.tool_version, result, captures };
  const intact = iterationDigest(base) === row.digest && result.statement === row.statement && result.meetsLimits === (row.meets_limits === 1) && result.unit === run.unit;
  return { id: row.id, number: row.number, startedAt: row.started_at, storedAt: row.stored_at, operator: row.operator, station: row.station, toolVersion: row.tool_version, result, captures, digest: row.digest, intact };
}

/**
 * The unit record with its calibration runs. A unit calibrated but never checked gets a record of its
 * own: no check runs, status 'not-measured' (a calibration is not a check against the whole spec).
 */
export function withCalibrations(rec: UnitRecord | undefined, unit: string, calibrations: readonly StoredCalibrationRun[]): UnitRecord | undefined {
  if (calibrations.length === 0) return rec;
  if (rec) return { ...rec, calibrations };
  const times = calibrations.flatMap((c) => c.iterations.map((i) => i.startedAt)).sort();
  const latest = calibrations[calibrations.length - 1];
  return { schemaVersion: 1, unit, status: 'not-measured', spec: latest.spec, firstTestedAt: times[0] ?? latest.startedAt, lastTestedAt: times[times.length - 1] ?? latest.startedAt, runs: [], calibrations };
}

export function calibratedSerials(db: Database): string[] {
  return (db.prepare('SELECT DISTINCT unit FROM calibration_runs ORDER BY unit').all() as { unit: string }[]).map((r) => r.unit);
}
