/**
 * YAML syntax errors in plain words, one problem per mistake: "line 12, column 1: a tab is used for
 * indentation; use spaces". The yaml parser reports one mistake several times (a tab, then the map it
 * broke, then the key that no longer fits on its line); here a tab in the indentation is found by
 * reading the lines, and of the parser's errors only the first of each run of neighbouring lines is
 * kept, the rest being consequences. Words are ours; the YAML rules are those of YAML 1.2.2 §6.1
 * (indentation is spaces only) and §7–8 (flow and block styles).
 */
import type { YAMLError } from 'yaml';
import type { BenchErrorFields } from '../types/index.js';

/** One syntax problem, as specError lists them. */
type SyntaxIssue = BenchErrorFields & { line?: number };

interface Words {
  readonly problem: string;
  readonly expected: string;
  readonly fix: string;
}

const INDENT: Words = {
  problem: 'this line is indented differently from the lines around it',
  expected: 'each key indented by the same number of spaces as the other keys of its map, two more than its parent',
  fix: 'line this key up with its neighbours (same number of leading spaces)',
};

/** Plain words for the parser's error codes (yaml's `YAMLError.code`); others keep the parser's message. */
const WORDS: Readonly<Record<string, Words>> = {
  BAD_INDENT: INDENT,
  BLOCK_AS_IMPLICIT_KEY: INDENT,
  MULTILINE_IMPLICIT_KEY: INDENT,
  MISSING_CHAR: {
    problem: 'a closing quote or bracket is missing',
    expected: 'every " or \' and every [ or { closed on the same value',
    fix: 'add the closing quote or bracket, or remove the opening one',
  },
  UNEXPECTED_TOKEN: {
    problem: 'a character here does not belong to YAML at this place',
    expected: '`key: value` lines, `- item` lines, or a quoted text',
    fix: 'quote a value that holds : # [ ] { } or starts with - ? *, or remove the stray character',
  },
  BAD_DQ_ESCAPE: {
    problem: 'a backslash in a double-quoted text starts an escape YAML does not know',
    expected: 'a known escape (\\\\, \\", \\n) or single quotes, where a backslash is plain text',
    fix: "write the value in single quotes ('C:\\path') or double the backslash",
  },
};

/**
 * The line a parser's indentation error is really about: the parser names the map a stray line
 * broke, often one line early. The first line from there on that sits deeper than the line before it
 * while that line opens no block (ends without ':') is the one moved.
 */
function misIndentedLine(lines: readonly string[], reported: number): { line: number; col: number } | null {
  for (let k = reported; k <= Math.min(lines.length, reported + 2); k++) {
    const text = lines[k - 1];
    if (text === undefined || text.trim() === '') continue;
    let p = k - 1;
    while (p >= 1 && lines[p - 1].trim() === '') p--;
    if (p < 1) continue;
    const prev = lines[p - 1];
    const prevContent = /^( *)(- +)?/.exec(prev)!;
    const contentIndent = prevContent[1].length + (prevContent[2]?.length ?? 0);
    const indent = /^ */.exec(text)![0].length;
    if (indent > contentIndent && !/:\s*(#.*)?$/.test(prev) && indent !== contentIndent) return { line: k, col: indent + 1 };
  }
  return null;
}

/** One issue per line whose indentation holds a tab. */
export function tabIndentIssues(text: string, file: string): SyntaxIssue[] {
  const issues: SyntaxIssue[] = [];
  text.split(/\r?\n/).forEach((line, i) => {
    const indent = /^[ \t]*/.exec(line)![0];
    const col = indent.indexOf('\t');
    if (col < 0 || line.trim() === '') return;
    issues.push({
      code: 'spec.syntax',
      file,
      line: i + 1,
      problem: `at column ${col + 1}, a tab is used for indentation; use spaces`,
      expected: 'indentation made of spaces only (YAML does not allow tabs there)',
      fix: 'replace the tab with spaces (set your editor to insert spaces for Tab)',
    });
  });
  return issues;
}

/** The parser's errors in plain words, one per mistake, after the tab issues already found. */
export function yamlSyntaxIssues(text: string, errors: readonly YAMLError[], file: string): SyntaxIssue[] {
  const tabs = tabIndentIssues(text, file);
  const covered = new Set(tabs.map((t) => t.line));
  const out = [...tabs];
  let lastLine = -2;
  for (const e of errors) {
    const line = e.linePos?.[0].line;
    const col = e.linePos?.[0].col;
    // Errors on the line of a mistake already named, or on the line right after it, follow from it.
    const after = line !== undefined && (covered.has(line) || covered.has(line - 1) || line === lastLine || line === lastLine + 1);
    if (line !== undefined) lastLine = line;
    if (after) {
      if (line !== undefined) covered.add(line);
      continue;
    }
    if (line !== undefined) covered.add(line);
    const words: Words = WORDS[e.code] ?? {
      problem: `the YAML cannot be read here (${e.message.split('\n')[0].replace(/ at line \d+, column \d+:?$/, '').toLowerCase()})`,
      expected: 'YAML (indented `key: value` lines) or JSON',
      fix: 'correct the syntax at this line (indentation, colons, closing quotes and brackets)',
    };
    const moved = WORDS[e.code] === INDENT && line !== undefined ? misIndentedLine(text.split(/\r?\n/), line) : null;
    if (moved) {
      covered.add(moved.line);
      lastLine = Math.max(lastLine, moved.line);
      out.push({ code: 'spec.syntax', file, line: moved.line, problem: `at column ${moved.col}, ${INDENT.problem}`, expected: INDENT.expected, fix: INDENT.fix });
      continue;
    }
    const where = col !== undefined ? `at column ${col}, ` : '';
    out.push({ code: 'spec.syntax', file, ...(line !== undefined ? { line } : {}), problem: `${where}${words.problem}`, expected: words.expected, fix: words.fix });
  }
  return out;
}
