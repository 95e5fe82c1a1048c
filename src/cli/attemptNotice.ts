/**
 * The one stderr line after a run is stored: which of the unit's runs and attempts it is, its state,
 * and the next step. Waiting: what is still to capture. Failed: the first likely cause and the
 * re-check command with a note. Passed: the unit's record.
 */
import { INCOMPLETE_WORD, STATEMENT_WORDS, waitingConditions } from '../types/index.js';
import type { Diagnosis, StoredRun } from '../types/index.js';
import { quoteArg } from './dataOptions.js';

/** What the user asked for the attempt, and where companion captures were read from. */
export interface AttemptRequest {
  readonly note?: string;
  readonly newAttempt?: boolean;
  /** Absolute path to read each capture's bytes from, by SHA-256 (archived companions). */
  readonly sources?: ReadonlyMap<string, string>;
  /** The spec file as the user gave it, for the re-check hint. */
  readonly specFile?: string;
}

/** The attempt fields of a new run. */
export function attemptFields(request: AttemptRequest): { note?: string; newAttempt?: boolean } {
  return { ...(request.note !== undefined ? { note: request.note } : {}), ...(request.newAttempt ? { newAttempt: true } : {}) };
}

/** `run 2 of FK-0106, attempt #2 (FAIL)`: per-unit numbers; the store-wide id in brackets. */
export function describeStoredRun(run: StoredRun): string {
  const waiting = waitingConditions(run.verdict);
  const state = waiting.length ? `${INCOMPLETE_WORD}, waiting for ${waiting.join(', ')}` : STATEMENT_WORDS[run.statement];
  const number = run.number !== undefined ? `run ${run.number}` : `run #${run.id}`;
  const attempt = run.attempt !== undefined ? `, attempt #${run.attempt}` : '';
  return `${number} of ${run.unit}${attempt} (${state})`;
}

/** The next step after storing this run. */
export function nextStep(run: StoredRun, diagnosis: Diagnosis, specFile: string | undefined): string {
  const waiting = waitingConditions(run.verdict);
  const spec = specFile !== undefined ? ` --spec ${quoteArg(specFile)}` : '';
  if (waiting.length) return `capture ${run.unit} at ${waiting.join(', ')} and check those files${spec}; benchproof units --waiting lists every unit still waiting`;
  if (run.statement === 'pass' || run.statement === 'conditional-pass') {
    return `benchproof record ${quoteArg(run.unit)} --format html --out ${quoteArg(`${run.unit}-record.html`)}`;
  }
  const files = run.captures.map((c) => quoteArg(c.path)).join(' ');
  const recheck = `benchproof check ${files}${spec} --note "what was changed"`;
  const cause = diagnosis.causes[0];
  if (!cause) return `see the checks that did not pass; after the repair, re-capture and ${recheck}`;
  return `look at ${cause.title}${cause.where ? ` (${cause.where})` : ''}; after the repair, re-capture and ${recheck}`;
}
