/**
 * A unit's record as CSV for spreadsheets: one row per test attempt × condition × checked measurement,
 * from the run that decides each attempt, with a header row, CRLF line ends and quoting as RFC 4180
 * §2. Values are plain numbers in the SI unit named in the `unit` column (no prefixes), at full
 * precision; U is the expanded uncertainty (k = 2); empty cells for none. `label` is the measurement's
 * display name (the label table) and `shown` the value ± U as every other report writes it (the one
 * formatter, U rounded up to two digits, GUM §7.2.6), with the export's decimal mark. With a comma decimal mark
 * the fields are separated by semicolons, as spreadsheets set to such a locale expect (common
 * practice, no source). Text cells are neutralised against formulas (escapeText.ts). The last column
 * holds the records' chain head, which pins the store's state the export was made from.
 */
import { formatMeasured, measurementLabel, waitingConditions } from '../types/index.js';
import type { StoredRun, UnitRecord } from '../types/index.js';
import { csvText } from './escapeText.js';

export const RECORD_CSV_COLUMNS = [
  'unit', 'attempt', 'attempt_state', 'run', 'run_id', 'started_at_utc', 'spec_revision', 'condition', 'output', 'measurement',
  'value', 'unit_si', 'expanded_uncertainty', 'lower', 'upper', 'statement', 'note', 'attempt_notes', 'label', 'shown', 'records_chain_head',
] as const;

export type DecimalMark = '.' | ',';

export function renderRecordCsv(rec: UnitRecord, mark: DecimalMark = '.'): string {
  const sep = mark === ',' ? ';' : ',';
  const cell = (s: string): string => {
    const t = csvText(s);
    return sep === ';' && !t.startsWith('"') && t.includes(';') ? `"${t.replace(/"/g, '""')}"` : t;
  };
  const num = (v: number | null): string => (v === null || !Number.isFinite(v) ? '' : mark === ',' ? String(v).replace('.', ',') : String(v));
  const lines = [RECORD_CSV_COLUMNS.join(sep)];
  for (const { attempt, run, notes } of decidingRuns(rec)) {
    const state = waitingConditions(run.verdict).length ? 'incomplete' : 'complete';
    for (const c of run.verdict.conditions) {
      for (const k of c.checks) {
        lines.push(
          [
            cell(rec.unit), String(attempt), state, String(run.number ?? ''), String(run.id), cell(run.startedAt), cell(run.spec.revision),
            cell(k.condition), cell(k.output), cell(k.measurement), num(k.value), cell(k.unit), num(k.expandedUncertainty),
            num(k.lower), num(k.upper), k.statement, cell(k.note ?? ''), cell(notes.join('; ')),
            // Added columns go last but one, so readers of the earlier layout keep their positions.
            cell(measurementLabel(k.measurement)), cell(shown(k.value, k.expandedUncertainty, k.unit, mark)),
            // The store's chain head when the export was made (README "Records"), on every row.
            rec.source?.chainHead ?? '',
          ].join(sep),
        );
      }
    }
  }
  return `${lines.join('\r\n')}\r\n`;
}

/** 'value ± U' as the reports show it, with the export's decimal mark; empty when withheld. */
function shown(value: number | null, U: number | null, unit: string, mark: DecimalMark): string {
  if (value === null || !Number.isFinite(value)) return '';
  const text = formatMeasured(value, U, unit);
  return mark === ',' ? text.replace(/(\d)\.(\d)/g, '$1,$2') : text;
}

/** The run that decides each attempt (its latest), oldest attempt first; each run alone without attempts. */
function decidingRuns(rec: UnitRecord): { attempt: number; run: StoredRun; notes: readonly string[] }[] {
  if (!rec.attempts?.length) return rec.runs.map((run, i) => ({ attempt: i + 1, run, notes: run.note ? [run.note] : [] }));
  return rec.attempts.flatMap((a) => {
    const run = rec.runs.find((r) => r.id === a.runIds[a.runIds.length - 1]);
    return run ? [{ attempt: a.number, run, notes: a.notes }] : [];
  });
}
