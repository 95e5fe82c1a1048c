/**
 * Words for a unit's test attempts, shared by the Markdown and HTML records: the state line, why an
 * attempt opened, the rows of the attempts table, and whether the unit was calibrated after its latest
 * check (then the check is out of date and the next step is a re-check).
 */
import type { AttemptReason, AttemptSummary, StoredRun, UnitRecord } from '../types/index.js';
import { INCOMPLETE_WORD, STATEMENT_WORDS } from '../types/index.js';
import { formatTime } from './reportNumbers.js';

export const REASON_WORDS: Readonly<Record<AttemptReason, string>> = {
  first: 'first test',
  'after-complete': 'tested again after a complete attempt',
  requested: 'new attempt asked for',
  note: 'after the work in the note',
  'after-calibration': 'after a calibration',
  'other-spec': 'against another spec',
};

/** `INCOMPLETE, waiting for mid, high (so far PASS)` or the statement word. */
export function stateWords(a: Pick<AttemptSummary, 'state' | 'statement' | 'soFar' | 'waitingFor'>): string {
  return a.state === 'incomplete' ? `${INCOMPLETE_WORD}, waiting for ${a.waitingFor.join(', ')} (so far ${STATEMENT_WORDS[a.soFar]})` : STATEMENT_WORDS[a.statement];
}

/** `run 2 of attempt #1 (#7 in the data folder)`. */
export function runLabel(r: StoredRun): string {
  const own = r.number !== undefined ? `run ${r.number}` : `run #${r.id}`;
  return `${own}${r.attempt !== undefined ? ` of attempt #${r.attempt}` : ''}${r.number !== undefined ? ` (#${r.id} in the data folder)` : ''}`;
}

/** One row per attempt, newest first: number, opened, why, state, runs, re-captures, notes. */
export function attemptRows(rec: UnitRecord): string[][] {
  const attempts = rec.attempts ?? [];
  const numberOf = new Map(rec.runs.map((r) => [r.id, r.number ?? r.id]));
  return [...attempts].reverse().map((a) => [
    `#${a.number}`,
    formatTime(a.startedAt),
    REASON_WORDS[a.reason],
    stateWords(a),
    a.runIds.map((id) => String(numberOf.get(id) ?? id)).join(', '),
    String(a.recaptures),
    a.notes.join('; '),
  ]);
}

export const ATTEMPT_HEAD = ['attempt', 'opened', 'why', 'state', 'runs', 're-captures', 'notes'] as const;

/** The newest calibration iteration stored after the latest check, when there is one. */
export function calibratedSince(rec: UnitRecord): { readonly at: string; readonly meetsLimits: boolean } | undefined {
  const last = rec.runs[rec.runs.length - 1];
  const its = (rec.calibrations ?? []).flatMap((c) => c.iterations).filter((i) => !last || i.storedAt > last.storedAt);
  const newest = its[its.length - 1];
  return newest ? { at: newest.startedAt, meetsLimits: newest.result.meetsLimits } : undefined;
}

/** A sentence for a calibration newer than the latest check, or ''. */
export function calibratedSinceText(rec: UnitRecord): string {
  const since = calibratedSince(rec);
  if (!since) return '';
  const how = since.meetsLimits ? 'met its calibration limits' : 'was calibrated (limits not met yet)';
  return `The unit ${how} on ${formatTime(since.at)}, after its latest check: the status above predates the trim; re-check the unit (its next check opens a new attempt).`;
}
