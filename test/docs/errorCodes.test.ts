/**
 * The README's error table lists exactly the codes of ERROR_CODES (src/types/errorCodes.ts), the
 * closed union every BenchError's code is typed by. The compiler keeps the source inside the union;
 * this test keeps the README equal to it, so a technician (or a script) that meets a code can look
 * it up, and the table never names a code that no longer exists.
 * Project rule (no source).
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { ERROR_CODES } from '../../src/types/index.js';

/** The text of the README's "## Error codes" section, up to the next second-level heading. */
function errorSection(readme: string): string {
  const start = readme.indexOf('\n## Error codes\n');
  if (start < 0) throw new Error('README has no "## Error codes" section');
  const end = readme.indexOf('\n## ', start + 1);
  return readme.slice(start, end < 0 ? undefined : end);
}

/** Codes named in the section's table rows: back-quoted `prefix.name` under a prefix the union uses. */
function tableCodes(section: string): string[] {
  const prefixes = new Set(ERROR_CODES.map((c) => c.split('.')[0]));
  const codes = new Set<string>();
  for (const row of section.split('\n').filter((l) => l.startsWith('| `'))) {
    const first = row.split(' | ')[0];
    for (const m of first.matchAll(/`([a-z]+)\.([a-z0-9-]+)`/g)) if (prefixes.has(m[1])) codes.add(`${m[1]}.${m[2]}`);
  }
  return [...codes].sort();
}

describe('error codes', () => {
  it('the union holds each code once, each a lower-case dotted id', () => {
    expect(new Set(ERROR_CODES).size).toBe(ERROR_CODES.length);
    expect(ERROR_CODES.filter((c) => !/^[a-z]+\.[a-z0-9]+(-[a-z0-9]+)*$/.test(c))).toEqual([]);
  });

  it('the table reader finds codes of every kind of row, including rows that list several', () => {
    const section = errorSection(readFileSync('README.md', 'utf8'));
    const found = tableCodes(section);
    for (const known of ['capture.no-time-base', 'spec.unknown-field', 'records.locked', 'usage.bad-number', 'output.is-link']) {
      expect(found, known).toContain(known);
    }
    expect(tableCodes('| `capture.empty`, `spec.syntax` | text with `records.db` and `capture.unreadable` |')).toEqual(['capture.empty', 'spec.syntax']);
  });

  it('the README error table lists exactly the codes of the union', () => {
    const listed = tableCodes(errorSection(readFileSync('README.md', 'utf8')));
    const union = [...ERROR_CODES].sort();
    expect({ missingFromReadme: union.filter((c) => !listed.includes(c)), notInUnion: listed.filter((c) => !union.includes(c as never)) }).toEqual({
      missingFromReadme: [],
      notInUnion: [],
    });
  });
});
