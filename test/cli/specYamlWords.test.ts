import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';

// YAML 1.2.2 §6.1: indentation is spaces only; a key indented unlike its siblings breaks the map.
// Each file below holds exactly the mistakes its test names; one problem is expected per mistake.
let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'benchproof-yaml-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const HEAD = 'name: x\nrevision: A\noutputs:\n  tri:\n';
function spec(name: string, body: string): string {
  const path = join(dir, name);
  writeFileSync(path, HEAD + body);
  return path;
}

describe('YAML syntax errors in plain words', () => {
  it('names a tab in the indentation once, with its line and column', async () => {
    const file = spec('tab.yaml', '\tchannel: 1\n    shape: triangle\n    checks:\n      - measure: frequency\n        nominal: 100 Hz\n');
    const r = await runCli(['spec', 'validate', file]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`${file}: 1 problem in the spec`);
    expect(r.stderr).toContain(`${file}:5: at column 1, a tab is used for indentation; use spaces\n  expected: indentation made of spaces only`);
  });

  it('names a mis-indented key at its own line, once', async () => {
    const file = spec('indent.yaml', '    channel: 1\n    shape: triangle\n     checks:\n      - measure: frequency\n        nominal: 100 Hz\n');
    const r = await runCli(['spec', 'validate', file]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`${file}: 1 problem in the spec`);
    expect(r.stderr).toContain(`${file}:7: at column 6, this line is indented differently from the lines around it`);
  });

  it('gives two problems for two mistakes, as JSON with --json', async () => {
    const file = spec('two.yaml', '\tchannel: 1\n    shape: triangle\n    checks:\n      - measure: frequency\n         nominal: 100 Hz\n');
    const r = await runCli(['spec', 'validate', file, '--json']);
    expect(r.code).toBe(2);
    const err = (JSON.parse(r.stderr) as { error: { code: string; issues: { code: string; line: number; problem: string }[] } }).error;
    expect(err.code).toBe('spec.invalid');
    expect(err.issues.map((i) => [i.code, i.line])).toEqual([
      ['spec.syntax', 5],
      ['spec.syntax', 9],
    ]);
    expect(err.issues.map((i) => i.problem).join('\n')).not.toMatch(/[A-Z][a-z]+ (are|is) not allowed|Implicit keys|compact mappings/);
  });
});
