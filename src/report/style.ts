/**
 * Terminal emphasis. We build our own chalk instance because chalk ignores NO_COLOR; the command line
 * decides whether colour is on (TTY, NO_COLOR, TERM=dumb, --no-color) and passes the answer here.
 * Status is always a word; colour only adds emphasis.
 */
import { Chalk } from 'chalk';
import type { Statement } from '../types/index.js';
import { STATEMENT_WORDS } from '../types/index.js';

export interface TextStyle {
  readonly color: boolean;
  bold(s: string): string;
  dim(s: string): string;
  good(s: string): string;
  warn(s: string): string;
  bad(s: string): string;
  statement(s: Statement): string;
}

export function createStyle(color: boolean): TextStyle {
  const c = new Chalk({ level: color ? 1 : 0 });
  const paint: Record<Statement, (s: string) => string> = {
    pass: (s) => c.green(s),
    'conditional-pass': (s) => c.yellow(s),
    'conditional-fail': (s) => c.yellow.bold(s),
    fail: (s) => c.red.bold(s),
    'not-measured': (s) => c.magenta(s),
  };
  return {
    color,
    bold: (s) => c.bold(s),
    dim: (s) => c.dim(s),
    good: (s) => c.green(s),
    warn: (s) => c.yellow(s),
    bad: (s) => c.red(s),
    statement: (st) => paint[st](STATEMENT_WORDS[st]),
  };
}

/** Colour only when the stream is a TTY, NO_COLOR is unset or empty, TERM is not dumb and no --no-color. */
export function colorWanted(isTTY: boolean, env: Readonly<Record<string, string | undefined>>, flag: boolean): boolean {
  if (!flag || !isTTY) return false;
  if (env.NO_COLOR !== undefined && env.NO_COLOR !== '') return false;
  if (env.TERM === 'dumb') return false;
  return true;
}
