/**
 * Batch statistics as CSV for spreadsheets: one row per checked quantity and spec, a header row, CRLF
 * line ends and quoting as RFC 4180 §2, numbers at full precision ('.' decimal), empty cells for none.
 * Text cells that a spreadsheet would run as a formula (=, +, −, @ first) get a leading apostrophe
 * (OWASP "CSV Injection" guidance), also after leading blanks (escapeText.ts). The last column holds
 * the records' chain head, which pins the store's state the report was made from. `label` is the
 * measurement's display name from the one label table, as in every other report.
 */
import type { BatchReport } from '../types/index.js';
import { measurementLabel } from '../types/index.js';
import { csvText } from './escapeText.js';
import { measurementNotes } from './batchRemarks.js';

export const BATCH_CSV_COLUMNS = [
  'spec', 'condition', 'output', 'measurement', 'unit', 'count', 'withheld', 'mean', 'sd', 'min', 'max',
  'lower', 'upper', 'nominal', 'cp', 'cpk', 'units', 'first_pass_yield', 'final_yield', 'notes', 'label', 'records_chain_head',
] as const;

const text = csvText;

function num(v: number | null): string {
  return v === null || !Number.isFinite(v) ? '' : String(v);
}

export function renderBatchCsv(batch: BatchReport): string {
  const lines = [BATCH_CSV_COLUMNS.join(',')];
  for (const s of batch.specs) {
    for (const m of s.measurements) {
      lines.push(
        [
          text(s.spec), text(m.condition), text(m.output), text(m.measurement), text(m.unit),
          String(m.count), String(m.withheld), num(m.mean), num(m.sd), num(m.min), num(m.max),
          num(m.lower), num(m.upper), num(m.nominal), num(m.cp), num(m.cpk),
          String(s.units.length), num(s.firstPass.fraction), num(s.final.fraction), text(measurementNotes(m).join('; ')),
          // Added columns go last but one, so readers of the earlier layout keep their positions.
          text(measurementLabel(m.measurement)),
          // The store's chain head when the report was made (README "Records"), on every row.
          batch.source?.chainHead ?? '',
        ].join(','),
      );
    }
  }
  return `${lines.join('\r\n')}\r\n`;
}
