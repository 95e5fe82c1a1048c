/** Capture files written to a fresh temporary folder for one test file, removed afterwards. */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';

export function tempFolder(): (name: string, content: string | Buffer) => string {
  const dir = mkdtempSync(join(tmpdir(), 'benchproof-capture-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  return (name, content) => {
    const path = join(dir, name);
    writeFileSync(path, content);
    return path;
  };
}
