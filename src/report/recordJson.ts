/** The per-unit record as one JSON document (schemaVersion 1): `runs`, each with `captures[].sha256`. */
import type { BatchReport, UnitRecord } from '../types/index.js';

export function renderRecordJson(rec: UnitRecord): string {
  return `${JSON.stringify(rec, null, 2)}\n`;
}

export function renderBatchJson(batch: BatchReport): string {
  return `${JSON.stringify(batch, null, 2)}\n`;
}
