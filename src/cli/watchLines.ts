/**
 * What `watch` prints. stdout: one line per checked capture (file, unit, condition, statement, first
 * likely cause, run number), or with --json one JSON object per line (NDJSON, schemaVersion 1).
 * stderr: the start line, skipped and unreadable files, and the closing summary; with --json each of
 * those is one JSON object per line too, errors carrying the BenchError fields.
 */
import { basename } from 'node:path';
import type { TextStyle } from '../report/index.js';
import { isBenchError, STATEMENT_WORDS } from '../types/index.js';
import type { Statement } from '../types/index.js';
import type { CaptureOutcome } from './watchCapture.js';

export interface WatchTally {
  readonly statements: Record<Statement, number>;
  recordedAlready: number;
  unmatched: number;
  errors: number;
}

export function emptyTally(): WatchTally {
  return { statements: { pass: 0, 'conditional-pass': 0, 'conditional-fail': 0, fail: 0, 'not-measured': 0 }, recordedAlready: 0, unmatched: 0, errors: 0 };
}

export function countOutcome(tally: WatchTally, o: CaptureOutcome): void {
  if (o.status === 'checked') tally.statements[o.statement] += 1;
  else if (o.status === 'calibration-step') tally.statements[o.iteration?.statement ?? o.statement] += o.iteration ? 1 : 0;
  else if (o.status === 'recorded-already') tally.recordedAlready += 1;
  else if (o.status === 'unmatched') tally.unmatched += 1;
  else tally.errors += 1;
}

export interface OutcomeLines {
  readonly stdout?: string;
  readonly stderr?: string;
}

/** The line(s) for one handled file, text or JSON. */
export function outcomeLines(o: CaptureOutcome, json: boolean, style: TextStyle, debug: boolean): OutcomeLines {
  if (json) return outcomeJson(o);
  const name = basename(o.file);
  switch (o.status) {
    case 'checked': {
      const waiting = o.state === 'incomplete';
      // A cause named from part of the conditions may change as the rest lands: it waits for them.
      const cause = o.cause && !waiting ? `  likely cause: ${o.cause.title}` : '';
      const record = o.record ? `; record ${o.record}` : o.recordError ? `; record NOT refreshed: ${oneLine(o.recordError)}` : '';
      // The unit's attempt over every condition captured so far, which may differ from this file's statement.
      const done = o.progress ? ` ${o.progress.captured}/${o.progress.total}` : '';
      const unit = waiting
        ? `${o.unit}${done}, waiting for ${(o.waitingFor ?? []).join(', ')}; so far ${style.statement(o.soFar ?? o.runStatement)}`
        : `${o.unit}${done}: ${style.statement(o.runStatement)}`;
      const run = o.runNumber !== undefined ? `run ${o.runNumber}${o.attempt !== undefined ? ` of attempt #${o.attempt}` : ''}` : `run #${o.runId}`;
      return { stdout: `${name}  ${o.unit}  ${o.condition}  ${style.statement(o.statement)}${cause}  (${unit}; ${run}${record})\n` };
    }
    case 'calibration-step': {
      const cents = o.cents === null ? 'not measured' : `${o.cents >= 0 ? '+' : '−'}${Math.abs(o.cents).toFixed(1)} cents`;
      const head = `${name}  ${o.unit}  step ${o.step}  ${cents}  ${style.statement(o.statement)}`;
      if (!o.iteration) return { stdout: `${head}  (waiting for ${o.missing.join(', ')})\n` };
      const it = o.iteration;
      const where = it.calibrationId !== undefined ? ` ${it.number} of calibration run #${it.calibrationId}` : '';
      const guidance = it.guidance.map((g) => `    ${g}\n`).join('');
      return { stdout: `${head}\n  iteration${where}: ${style.statement(it.statement)}${it.meetsLimits ? ' (meets the calibration limits)' : ''}\n${guidance}` };
    }
    case 'recorded-already':
      return { stderr: `benchproof: ${name}: already recorded for ${o.unit} at ${o.condition} (run #${o.runId}); not stored again\n` };
    case 'unmatched':
      return { stderr: `benchproof: skipped ${name}: ${oneLine(o.error)}\n` };
    case 'error': {
      const internal = isBenchError(o.error) ? '' : 'internal error: ';
      const stack = debug && !isBenchError(o.error) && o.error.stack ? `\n${o.error.stack}` : '';
      return { stderr: `benchproof: could not check ${name}: ${internal}${oneLine(o.error)}${stack}\n` };
    }
  }
}

function outcomeJson(o: CaptureOutcome): OutcomeLines {
  const line = (x: object): string => `${JSON.stringify({ schemaVersion: 1, ...x })}\n`;
  switch (o.status) {
    case 'checked': {
      const { status, recordError, ...rest } = o;
      return { stdout: line({ event: status, ...rest, words: STATEMENT_WORDS[o.statement], ...(recordError ? { recordError: errorJson(recordError) } : {}) }) };
    }
    case 'recorded-already':
      return { stderr: line({ event: o.status, file: o.file, unit: o.unit, condition: o.condition, runId: o.runId }) };
    case 'calibration-step': {
      const { status, ...rest } = o;
      return { stdout: line({ event: status, ...rest, words: STATEMENT_WORDS[o.statement] }) };
    }
    default:
      return { stderr: line({ event: o.status, file: o.file, error: errorJson(o.error) }) };
  }
}

function errorJson(err: Error): object {
  return isBenchError(err) ? err.toJSON() : { code: 'internal', file: '-', problem: err.message, exitCode: 3 };
}

/** A BenchError in one line: where and what, then the fix. */
function oneLine(err: Error): string {
  if (!isBenchError(err)) return err.message.split('\n')[0];
  return `${err.line !== undefined ? `line ${err.line}: ` : ''}${err.problem}; fix: ${err.fix}`;
}

/** The closing line on stderr: files checked and their statements, and what else happened. */
export function summaryLine(tally: WatchTally, json: boolean, extra: { readonly waiting: number; readonly data: string }): string {
  const s = tally.statements;
  const checked = Object.values(s).reduce((a, b) => a + b, 0);
  if (json) {
    const { recordedAlready, unmatched, errors } = tally;
    return `${JSON.stringify({ schemaVersion: 1, event: 'summary', checked, statements: s, recordedAlready, unmatched, errors, ...extra })}\n`;
  }
  const words = (Object.keys(s) as Statement[]).filter((k) => k === 'pass' || k === 'fail' || s[k] > 0).map((k) => `${s[k]} ${STATEMENT_WORDS[k]}`);
  const others = [
    tally.recordedAlready ? `${tally.recordedAlready} already recorded` : '',
    tally.unmatched ? `${tally.unmatched} not matching the pattern` : '',
    tally.errors ? `${tally.errors} could not be checked` : '',
    extra.waiting ? `${extra.waiting} still landing (left for the next start)` : '',
  ].filter(Boolean);
  return `benchproof: watch stopped: ${checked} file(s) checked (${words.join(', ')})${others.length ? `, ${others.join(', ')}` : ''}; runs in ${extra.data}\n`;
}
