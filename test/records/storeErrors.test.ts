import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { openStore, storeError } from '../../src/records/index.js';
import { BenchError } from '../../src/types/index.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';

let root: string;
beforeEach(() => {
  root = makeTempDir();
});
afterEach(() => removeTempDir(root));

function codeOf(fn: () => unknown): string | undefined {
  try {
    fn();
  } catch (err) {
    expect(err).toBeInstanceOf(BenchError);
    return (err as BenchError).code;
  }
  return undefined;
}

describe('record store errors', () => {
  it('reports a locked database as records.locked once the busy timeout has passed, storing nothing', () => {
    const dir = join(root, 'data');
    const store = openStore(dir, { busyTimeoutMs: 150 });
    const other = new Database(join(dir, 'records.db'));
    other.exec('BEGIN EXCLUSIVE');
    expect(codeOf(() => store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:00:00Z' })))).toBe('records.locked');
    other.exec('ROLLBACK');
    other.close();
    expect(store.listUnits()).toEqual([]);
    store.close();
  });

  it('reports a data folder whose parent does not exist as records.data-missing, creating nothing', () => {
    expect(codeOf(() => openStore(join(root, 'no-such-parent', 'benchproof-data')))).toBe('records.data-missing');
  });

  it('reports a data folder path that is a file as records.data-missing', () => {
    const file = join(root, 'not-a-folder');
    writeFileSync(file, 'x');
    expect(codeOf(() => openStore(file))).toBe('records.data-missing');
  });

  it('reports a folder without records as records.empty when only reading', () => {
    expect(codeOf(() => openStore(join(root, 'nothing-here'), { mode: 'read' }))).toBe('records.empty');
    expect(codeOf(() => openStore(root, { mode: 'read' }))).toBe('records.empty');
  });

  it('maps read-only and permission failures of the folder or database to records.read-only', () => {
    for (const code of ['EACCES', 'EROFS', 'EPERM', 'SQLITE_READONLY', 'SQLITE_READONLY_DBMOVED']) {
      const mapped = storeError(Object.assign(new Error(code), { code }), '/bench/data');
      expect((mapped as BenchError).code, code).toBe('records.read-only');
    }
    const other = new Error('something else');
    expect(storeError(other, '/bench/data')).toBe(other);
  });

  it.skipIf(process.getuid?.() === 0)('reports a read-only data folder as records.read-only when storing (not testable as root)', async () => {
    const { chmodSync } = await import('node:fs');
    const dir = join(root, 'data');
    openStore(dir).close();
    chmodSync(dir, 0o555);
    chmodSync(join(dir, 'records.db'), 0o444);
    expect(codeOf(() => openStore(dir).saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:00:00Z' })))).toBe('records.read-only');
  });
});
