/** Rows of the `measurements` table: every value measured from every channel of a run's captures. */
import type { Database } from 'better-sqlite3';
import type { UnitVerdict } from '../types/index.js';

const INSERT = `INSERT INTO measurements
  (run_id, capture_index, capture_sha256, channel_index, channel, measurement, value, uncertainty, unit, reason, method)
  VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`;

export function insertMeasurements(db: Database, runId: number, verdict: UnitVerdict): void {
  const stmt = db.prepare(INSERT);
  verdict.captures.forEach((capture, ci) => {
    capture.report.channels.forEach((channel, chi) => {
      for (const [id, m] of Object.entries(channel.measurements)) {
        if (!m) continue;
        stmt.run(runId, ci, capture.sha256, chi, channel.name, id, m.value, m.uncertainty, m.unit, m.reason ?? null, m.method ?? null);
      }
    });
  });
}
