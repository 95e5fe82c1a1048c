/**
 * Temporary folders made by the tests (through `tempFolder`), removed when a test file ends or at
 * the latest when its worker exits (a setup file), so a run of the suite leaves nothing behind in
 * the system's temporary folder.
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

function removeMade(): void {
  for (const dir of made().splice(0)) rmSync(dir, { recursive: true, force: true });
}

afterAll(removeMade);

// Test files share a worker's modules (isolate: false), so this file's top level may run once per
// worker rather than once per file: the folders still made are removed when the worker exits.
const EXIT_HOOK = Symbol.for('benchproof.test.tempFolders.exitHook');
const flags = globalThis as { [EXIT_HOOK]?: boolean };
if (!flags[EXIT_HOOK]) {
  flags[EXIT_HOOK] = true;
  process.once('exit', removeMade);
}
