/**
 * The width text output is fitted to: COLUMNS when set to a whole number (the shell's, or the user's
 * own choice), else the terminal's width when stdout is one, else 80 columns, the classic terminal
 * width (common practice, no source). Never below 40, where no table can be read anyway.
 */
import type { CliIo } from './io.js';

export const DEFAULT_WIDTH = 80;
const NARROWEST = 40;

export function terminalWidth(io: CliIo): number {
  const fromEnv = Number(io.env.COLUMNS);
  const chosen = Number.isInteger(fromEnv) && fromEnv > 0 ? fromEnv : io.stdoutIsTTY && io.stdoutColumns ? io.stdoutColumns : DEFAULT_WIDTH;
  return Math.max(NARROWEST, chosen);
}

/**
 * The width to fit a table to when it is known (COLUMNS, or a terminal on stdout); unbounded when
 * piped to a file or another program, which keeps one line per row for scripts.
 */
export function knownWidth(io: CliIo): number {
  return Number(io.env.COLUMNS) > 0 || (io.stdoutIsTTY && io.stdoutColumns) ? terminalWidth(io) : Number.POSITIVE_INFINITY;
}

/**
 * A notice on stderr broken at spaces into lines of at most `width` columns, continuation lines
 * indented two spaces; a word longer than the line (a long path) stands whole on a line of its own,
 * since a command to copy must not be cut. Not report's `wrap`: that one abbreviates an over-long
 * word (right for a table cell, wrong for a command to copy), and importing the report stage here
 * would load it at start-up for every command that registers the data options.
 */
export function wrapNotice(text: string, width: number): string {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(' ')) {
    if (line !== '' && [...line].length + 1 + [...word].length > width) {
      lines.push(line);
      line = `  ${word}`;
    } else line = line === '' ? word : `${line} ${word}`;
  }
  lines.push(line);
  return lines.join('\n');
}
