/**
 * Escaping of text that came from outside (file names, serials, operator and station names, spec
 * strings, the data folder path) for the formats that would otherwise take it as syntax.
 *
 * Markdown (CommonMark 0.31 §2.4 backslash escapes; GitHub Flavored Markdown tables §4.10, where an
 * unescaped `|` or a line end splits a table row, also inside a code span): every ASCII punctuation
 * character that can start syntax is backslash-escaped, `<` and `>` included so no raw HTML can form;
 * line ends (LF, CR, NEL, U+2028, U+2029) and tabs become spaces, and any other control character is
 * shown as its `\xNN` / `\uNNNN` escape, never written raw. Characters that start syntax only at the
 * start of a line (`#`, `-`, `+`) are left alone: escaped text never starts a line here.
 *
 * CSV (RFC 4180 §2): quoting, plus the OWASP "CSV Injection" guidance: a cell that a spreadsheet
 * would run as a formula gets a leading apostrophe. Spreadsheets skip leading blanks before `=`, so
 * the test looks past leading white space (and the full-width forms of = + − @).
 */

const LINE_BREAKS = /[\t\n\r\u0085\u2028\u2029]/g;
// eslint-disable-next-line no-control-regex -- finding control characters is the point
const CONTROLS = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/g;

/** A control character as the escape a reader can see: `\x1b`, `\u202e`. */
export function visibleControl(c: string): string {
  const code = c.charCodeAt(0);
  return code <= 0xff ? `\\x${code.toString(16).padStart(2, '0')}` : `\\u${code.toString(16).padStart(4, '0')}`;
}

/** Text for a Markdown paragraph, list item, heading or table cell. */
export function mdText(s: string): string {
  return s
    .replace(LINE_BREAKS, ' ')
    .replace(/[\\`*_[\]<>|~&]/g, '\\$&')
    .replace(CONTROLS, (c) => `\\${visibleControl(c)}`);
}

const FORMULA_START = /^[\s\u00a0\u3000]*[=+\-@\uff1d\uff0b\uff0d\uff20]|^[\t\r\n]/;

/** One CSV text cell: neutralised against formulas, then quoted when it holds `"`, `,` or a line end. */
export function csvText(s: string): string {
  const safe = FORMULA_START.test(s) ? `'${s}` : s;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}
