/**
 * Temporary folders made by the shared test helpers, removed when each test file ends (a setup
 * file, so the hook applies to every file), so a run of the suite leaves nothing behind in the
 * system's temporary folder.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';

const KEY = Symbol.for('benchproof.test.tempFolders');
type Holder = { [KEY]?: string[] };

function made(): string[] {
  const holder = globalThis as Holder;
  return (holder[KEY] ??= []);
}

/** A fresh folder under the system's temporary folder, removed when the test file ends. */
export function tempFolder(prefix: string): string {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  made().push(dir);
  return dir;
}

afterAll(() => {
  for (const dir of made().splice(0)) rmSync(dir, { recursive: true, force: true });
});
