/**
 * Turns what the file system and SQLite report about the data folder into BenchErrors a technician
 * can act on. Anything not recognised is returned unchanged and ends as an internal error (exit 3).
 */
import { BenchError } from '../types/index.js';

const OVERRIDE = 'give another folder with --data DIR or BENCHPROOF_DATA';

function codeOf(err: unknown): string {
  if (typeof err === 'object' && err !== null && 'code' in err) return String((err as { code: unknown }).code);
  return '';
}

/** Map a low-level error met while using the data folder `dir` to a BenchError, or return it as it was. */
export function storeError(err: unknown, dir: string): unknown {
  if (err instanceof BenchError) return err;
  const code = codeOf(err);
  if (code === 'SQLITE_BUSY' || code.startsWith('SQLITE_BUSY_') || code === 'SQLITE_LOCKED') return lockedError(dir);
  if (code.startsWith('SQLITE_READONLY') || code === 'EACCES' || code === 'EPERM' || code === 'EROFS') {
    return readOnlyError(dir);
  }
  if (code === 'SQLITE_CORRUPT' || code === 'SQLITE_NOTADB') {
    return new BenchError({
      code: 'records.damaged',
      file: dir,
      problem: 'the record database in this data folder is damaged or is not a benchproof database',
      expected: 'a benchproof-data folder written by benchproof',
      fix: `do not delete it; copy the folder somewhere safe and restore records.db from your last backup, or ${OVERRIDE}`,
    });
  }
  if (code === 'SQLITE_FULL' || code === 'ENOSPC') {
    return new BenchError({
      code: 'records.disk-full',
      file: dir,
      problem: 'the disk holding the data folder is full; nothing was stored',
      expected: 'free space for the run and its captures',
      fix: 'free some space on that disk and run the command again',
    });
  }
  if (code === 'SQLITE_CANTOPEN' || code === 'ENOENT' || code === 'ENOTDIR') return missingError(dir);
  return err;
}

export function lockedError(dir: string): BenchError {
  return new BenchError({
    code: 'records.locked',
    file: dir,
    problem: 'the record database stayed locked by another program; nothing was stored',
    expected: 'a data folder no other program holds open for writing',
    fix: 'close the other program that has records.db open (a database browser, a stuck benchproof) and run the command again',
  });
}

export function readOnlyError(dir: string): BenchError {
  return new BenchError({
    code: 'records.read-only',
    file: dir,
    problem: 'the data folder cannot be written (read-only or no permission); nothing was stored',
    expected: 'a data folder this user may write to',
    fix: `make the folder writable for this user, or ${OVERRIDE}`,
  });
}

export function missingError(dir: string): BenchError {
  return new BenchError({
    code: 'records.data-missing',
    file: dir,
    problem: 'the data folder does not exist, or a part of its path is not a folder',
    expected: 'an existing folder, or a new folder name inside an existing one',
    fix: `check the path for a typo, create its parent folder, or ${OVERRIDE}`,
  });
}

export function noRecordsError(dir: string): BenchError {
  return new BenchError({
    code: 'records.empty',
    file: dir,
    problem: 'there are no stored records here: the data folder or its records.db does not exist yet',
    expected: 'a data folder that `benchproof check` has stored runs in',
    fix: `run \`benchproof check\` on a unit's captures first, or ${OVERRIDE}`,
  });
}
