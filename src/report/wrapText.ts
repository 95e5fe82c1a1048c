/**
 * Fitting text to a terminal: lines broken at spaces to a width, continuation lines indented under
 * the first word, a word longer than the line cut with "…". Width is counted in code points with the
 * terminal's colour codes left out (all our symbols are one column wide; common practice, no source).
 * A no-break space (U+00A0) glues a quantity's parts ('2 061.61 Hz') so a line never splits it; it is
 * written out as a plain space.
 */

export const GLUE = '\u00a0';

/** The text with its spaces made unbreakable, for one quantity or a short phrase. */
export const glued = (s: string): string => s.replace(/ /g, GLUE);
const unglued = (s: string): string => s.replace(/\u00a0/g, ' ');

// eslint-disable-next-line no-control-regex
const ANSI = /\u001b\[[0-9;]*m/g;

/** Columns a string takes on a terminal (colour codes excluded). */
export function visibleWidth(s: string): number {
  return [...s.replace(ANSI, '')].length;
}

/** Cut a plain string to `width` columns, ending in "…" when cut. */
export function abbreviate(s: string, width: number): string {
  const chars = [...s];
  return chars.length <= width ? s : `${chars.slice(0, Math.max(0, width - 1)).join('')}…`;
}

/**
 * `text` broken into lines of at most `width` columns: the first line starts with `first` (e.g. two
 * spaces and a symbol), the rest with `rest` (spaces lining up under the first word).
 */
export function wrap(text: string, width: number, first = '', rest = first.replace(/[^ ]/g, ' ')): string[] {
  // A line that fits keeps its spacing (aligned columns); only longer ones are broken.
  if (visibleWidth(first) + visibleWidth(text) <= width) return [unglued(`${first}${text}`)];
  // Words with the spaces before each kept, so aligned columns stay aligned on the lines that fit.
  const words = [...text.matchAll(/( *)([^ ]+)/g)].map((m) => ({ gap: m[1], word: m[2] }));
  const lines: string[] = [];
  let line = first;
  let lineHasWord = false;
  for (const { gap, word } of words) {
    const sep = lineHasWord ? gap || ' ' : '';
    if (visibleWidth(word) <= width - visibleWidth(line) - sep.length) {
      line += sep + word;
      lineHasWord = true;
      continue;
    }
    if (lineHasWord) {
      lines.push(line);
      line = rest;
    }
    const fit = width - visibleWidth(line);
    line += visibleWidth(word) <= fit ? word : abbreviate(word.replace(ANSI, ''), fit);
    lineHasWord = true;
  }
  lines.push(line);
  return lines.map(unglued);
}

/** Lines wider than `width` wrapped, each continuation indented two columns past the line's own indent. */
export function fitLines(lines: readonly string[], width: number): string[] {
  return lines.flatMap((l) => {
    if (visibleWidth(l) <= width) return [unglued(l)];
    const indent = /^ */.exec(l.replace(ANSI, ''))![0];
    return wrap(l.slice(l.indexOf(l.trimStart())), width, indent, `${indent}  `);
  });
}
