/**
 * A symbol beside each statement word, so statements differ in word and shape, never in colour or
 * weight alone (a colour-blind reader, a monochrome terminal, a printed page). Our own choice of
 * marks (common practice, no source): a tick for a pass, a cross for a fail, the same in brackets when
 * the decision is conditional (ILAC-G8:09/2019 §4.2.3), a question mark when nothing was decided.
 */
import type { Statement } from '../types/index.js';

export const STATEMENT_MARKS: Readonly<Record<Statement, string>> = {
  pass: '✓',
  'conditional-pass': '(✓)',
  'conditional-fail': '(✗)',
  fail: '✗',
  'not-measured': '?',
};

/** The mark of a unit still waiting for captures. */
export const INCOMPLETE_MARK = '…';
