/**
 * Nothing from outside reaches a terminal raw. File names, serials, operator names, spec strings and
 * channel names can hold control characters (ESC sequences that retitle the window or clear the
 * screen, a carriage return that overwrites the line, bidirectional overrides that reorder it). Every
 * string a command writes to stdout or stderr passes through `terminalSafe`: each such character is
 * shown as its escape (`\x1b`, a lone `\r` as `\x0d`, `\u202e`), never written. Line feeds, CR LF
 * line ends and tabs, which the tool's own layout uses, pass; so do colour sequences (SGR,
 * `ESC [ … m`, ECMA-48 §8.3.117), but only on a stream that may be coloured at all (a TTY with
 * NO_COLOR unset and TERM not dumb). JSON output is unaffected: JSON.stringify already writes control
 * characters as \u escapes.
 */
import type { CliIo } from './io.js';

// eslint-disable-next-line no-control-regex -- finding control characters is the point
const SGR = /\x1b\[[0-9;]*m/y;
// eslint-disable-next-line no-control-regex -- finding control characters is the point
const UNSAFE = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/;

function escapeOne(c: string): string {
  const code = c.charCodeAt(0);
  return code <= 0xff ? `\\x${code.toString(16).padStart(2, '0')}` : `\\u${code.toString(16).padStart(4, '0')}`;
}

/** `s` with every control character escaped, keeping \n, \t and (when `colour`) SGR colour sequences. */
export function terminalSafe(s: string, colour: boolean): string {
  if (!UNSAFE.test(s)) return s;
  let out = '';
  for (let i = 0; i < s.length; i++) {
    const c = s[i];
    if (c === '\x1b' && colour) {
      SGR.lastIndex = i;
      const m = SGR.exec(s);
      if (m) {
        out += m[0];
        i += m[0].length - 1;
        continue;
      }
    }
    // CR LF is a line end (the CSV report's, RFC 4180); a lone CR would overwrite the line.
    if (c === '\r' && s[i + 1] === '\n') {
      out += c;
      continue;
    }
    out += UNSAFE.test(c) ? escapeOne(c) : c;
  }
  return out;
}

/** May this stream carry colour at all (the same conditions the text style checks, before --no-color)? */
function colourPossible(isTTY: boolean, env: CliIo['env']): boolean {
  return isTTY && !env.NO_COLOR && env.TERM !== 'dumb';
}

/** The same io, with every write made terminal-safe. */
export function terminalSafeIo(io: CliIo): CliIo {
  const outColour = colourPossible(io.stdoutIsTTY, io.env);
  const errColour = colourPossible(io.stderrIsTTY, io.env);
  return {
    ...io,
    stdout: (s) => io.stdout(terminalSafe(s, outColour)),
    stderr: (s) => io.stderr(terminalSafe(s, errColour)),
  };
}
