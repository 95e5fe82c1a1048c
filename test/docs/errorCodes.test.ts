/**
 * Every user-facing error code the source can raise is listed in the README, so a technician (or a
 * script) that meets one can look it up. Codes are read from the source text: `code: '…'` literals,
 * the capture reader's `captureError('…')` calls and the list in src/capture/index.ts.
 * Project rule (no source).
 */
import { describe, it, expect } from 'vitest';
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? sourceFiles(path) : path.endsWith('.ts') ? [path] : [];
  });
}

const STAGES = '(capture|spec|records|usage|init|check|calibration|watch|output)';

function codesInSource(): Set<string> {
  const codes = new Set<string>();
  for (const file of sourceFiles('src')) {
    const text = readFileSync(file, 'utf8');
    for (const m of text.matchAll(new RegExp(`'(${STAGES}\\.[a-z0-9-]+)'`, 'g'))) codes.add(m[1]);
    for (const m of text.matchAll(/captureError\(\s*'([a-z-]+)'/g)) codes.add(`capture.${m[1]}`);
  }
  const index = readFileSync('src/capture/index.ts', 'utf8');
  for (const m of index.matchAll(/^ \*\s+(capture\.[a-z-]+)\s/gm)) codes.add(m[1]);
  codes.delete('records.db'); // the database file name, not a code
  return codes;
}

describe('error codes', () => {
  it('finds the codes it is meant to find in the source', () => {
    const codes = codesInSource();
    for (const known of ['capture.no-time-base', 'capture.time-backwards', 'spec.unknown-field', 'records.locked', 'usage.bad-number']) {
      expect(codes.has(known), known).toBe(true);
    }
  });

  it('lists every code the source can raise in the README', () => {
    const readme = readFileSync('README.md', 'utf8');
    const missing = [...codesInSource()].filter((code) => !readme.includes(`\`${code}\``)).sort();
    expect(missing).toEqual([]);
  });
});
