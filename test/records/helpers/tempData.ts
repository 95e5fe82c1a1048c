/** A fresh data folder per test under the system temp folder, removed afterwards (read-only files included). */
import { chmodSync, mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export function makeTempDir(prefix = 'benchproof-records-'): string {
  return mkdtempSync(join(tmpdir(), prefix));
}

function makeWritable(path: string): void {
  const st = statSync(path);
  chmodSync(path, st.isDirectory() ? 0o755 : 0o644);
  if (st.isDirectory()) for (const name of readdirSync(path)) makeWritable(join(path, name));
}

export function removeTempDir(dir: string): void {
  try {
    makeWritable(dir);
  } catch {
    // Already gone.
  }
  rmSync(dir, { recursive: true, force: true });
}
