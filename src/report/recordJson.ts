/**
 * The per-unit record and the batch statistics as JSON documents (schemaVersion 1): `runs`, each with
 * `captures[].sha256`; both carry `labels`, the display name of each measurement id they hold (the
 * label table). Fields may be added, never renamed.
 */
import type { BatchReport, UnitRecord } from '../types/index.js';
import { measurementLabelsOf } from '../types/index.js';

export function renderRecordJson(rec: UnitRecord): string {
  const labels = measurementLabelsOf(rec.runs.flatMap((r) => r.verdict.conditions.flatMap((c) => c.checks.map((k) => k.measurement))));
  return `${JSON.stringify({ ...rec, labels }, null, 2)}\n`;
}

export function renderBatchJson(batch: BatchReport): string {
  const labels = measurementLabelsOf(batch.specs.flatMap((s) => s.measurements.map((m) => m.measurement)));
  return `${JSON.stringify({ ...batch, labels }, null, 2)}\n`;
}
