import { describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';
import { systemErrorWords } from '../../src/types/index.js';

// Meanings of the codes after POSIX.1-2017 <errno.h>; the CLI paths are the spec reader's.
describe('system error codes in words', () => {
  it('a missing spec file says there is nothing at the path, never (ENOENT)', async () => {
    const r = await runCli(['check', '--no-store', 'samples/captures/FK-0101_mid.csv', '--spec', 'no-such-spec.yaml']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('cannot read the spec: there is no file or folder at this path');
    expect(r.stderr).not.toMatch(/\bE[A-Z]{3,}\b/);
  });

  it('a folder given as the spec says it is a folder (EISDIR)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'benchproof-errno-'));
    try {
      const r = await runCli(['spec', 'validate', dir]);
      expect(r.code).toBe(2);
      expect(r.stderr).not.toMatch(/\bE[A-Z]{3,}\b/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('systemErrorWords words each common code and keeps an unknown one visible', () => {
    expect(systemErrorWords('EACCES')).toBe('this user is not allowed to open it');
    expect(systemErrorWords('EISDIR')).toBe('this is a folder, not a file');
    expect(systemErrorWords('EWHATEVER')).toBe('the system reported error EWHATEVER');
  });
});
