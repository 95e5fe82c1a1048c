/**
 * The per-unit record and the batch statistics as JSON documents (schemaVersion 1): `runs`, each with
 * `captures[].sha256`; both carry `labels`, the display name of each measurement id they hold (the
 * label table). Fields may be added, never renamed.
 */
import type { BatchReport, UnitRecord } from '../types/index.js';
import { measurementLabelsOf } from '../types/index.js';
import { batchRemarkWords, measurementNotes } from './batchRemarks.js';

export function renderRecordJson(rec: UnitRecord): string {
  const labels = measurementLabelsOf(rec.runs.flatMap((r) => r.verdict.conditions.flatMap((c) => c.checks.map((k) => k.measurement))));
  return `${JSON.stringify({ ...rec, labels }, null, 2)}\n`;
}

export function renderBatchJson(batch: BatchReport): string {
  const labels = measurementLabelsOf(batch.specs.flatMap((s) => s.measurements.map((m) => m.measurement)));
  // The remarks as data and, beside them, in words (`notes`), as the text reports give them.
  const specs = batch.specs.map((s) => ({ ...s, notes: s.remarks.map((r) => batchRemarkWords(r)), measurements: s.measurements.map((m) => ({ ...m, notes: measurementNotes(m) })) }));
  return `${JSON.stringify({ ...batch, specs, labels }, null, 2)}\n`;
}
